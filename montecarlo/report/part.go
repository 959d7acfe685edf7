package report

import (
	"bytes"
	"crypto/sha256"
	"encoding/base64"
	"encoding/binary"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/invopop/jsonschema"

	"boltrisk/model"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/interval"
	"boltrisk/montecarlo/rare"
	"boltrisk/montecarlo/scenario"
)

// PartFormat is the version of the part-file layout; a merge reads only
// its own.
const PartFormat = 1

// PartDoc is a part file: one part of a run split over a batch cluster's
// job array (`simulate --part K/N`, `sweep --part K/N`), holding the exact
// state that `boltrisk merge` adds up to the one-machine result.
type PartDoc struct {
	SchemaVersion int    `json:"schema_version"`
	Kind          string `json:"kind" jsonschema:"enum=part"`
	ToolVersion   string `json:"tool_version"`
	// PartFormat is the layout version of part files (1).
	PartFormat int `json:"part_format"`
	// Command is the command that was split: simulate or sweep.
	Command string `json:"command" jsonschema:"enum=simulate,enum=sweep"`
	// Part counts from 1 to Parts.
	Part  int `json:"part"`
	Parts int `json:"parts"`
	// Scenario identifies the scenario; Source is its complete text, so that
	// the merge rebuilds the documents without the file.
	Scenario ScenarioInfo `json:"scenario"`
	// SourceName is the name the scenario was read under (a path,
	// "(standard input)" or "example:NAME").
	SourceName string       `json:"source_name"`
	Source     string       `json:"source"`
	Settings   PartSettings `json:"settings"`
	// Vary is the swept input of a sweep part.
	Vary *PartVary `json:"vary,omitempty"`
	// Steps holds the state of each step (one for simulate).
	Steps []PartStep `json:"steps"`
	// Workers and ElapsedSeconds describe how the part ran (provenance).
	Workers        int     `json:"workers"`
	ElapsedSeconds float64 `json:"elapsed_s"`
	// Checksum is the SHA-256 of the document with this field empty: a
	// changed or damaged file is refused.
	Checksum string `json:"checksum"`
}

// PartSettings are the run settings every part of a split must share.
type PartSettings struct {
	Samples    int64   `json:"samples"`
	Seed       uint64  `json:"seed"`
	Confidence float64 `json:"confidence"`
	// Interval is the --interval choice: auto, exact or wilson.
	Interval string `json:"interval"`
	// Method is the method asked for (crude or auto); each step records
	// what it ran.
	Method string   `json:"method"`
	Modes  []string `json:"modes,omitempty"`
	// ProbabilitiesOnly: the run keeps no histograms (sweeps).
	ProbabilitiesOnly bool `json:"probabilities_only"`
}

// PartVary is the swept input of a sweep part.
type PartVary struct {
	// Spec is the --vary argument (INPUT=LO..HI[UNIT]) and Steps --steps.
	Spec  string `json:"spec"`
	Steps int    `json:"steps"`
	// MethodNote says what auto chose for every step, and why.
	MethodNote string `json:"method_note,omitempty"`
}

// PartStep is the exact state of one run of a part.
type PartStep struct {
	Method     string `json:"method" jsonschema:"enum=crude,enum=importance"`
	MethodNote string `json:"method_note,omitempty"`
	// FirstChunk and EndChunk bound the part's chunks [first, end).
	FirstChunk  int64 `json:"first_chunk"`
	EndChunk    int64 `json:"end_chunk"`
	Samples     int64 `json:"samples"`
	Invalid     int64 `json:"invalid"`
	Any         int64 `json:"any_failures"`
	Binned      int64 `json:"binned"`
	BoltSamples int64 `json:"bolt_evaluations"`
	// Failures and BoltFailures count by mode key (modes with none left out).
	Failures     map[string]int64 `json:"failures"`
	BoltFailures map[string]int64 `json:"bolt_failures"`
	// CaseFailures and CaseAny count failures per load case, in the
	// scenario's order (absent without load cases).
	CaseFailures []map[string]int64 `json:"case_failures,omitempty"`
	CaseAny      []int64            `json:"case_any,omitempty"`
	BinStride    int64              `json:"bin_stride"`
	// ChunkSums holds each chunk's count, sum and sum of squares of the
	// residual preload, in N (exact decimal of the float64).
	ChunkSums [][3]float64 `json:"chunk_sums"`
	Sketches  []PartSketch `json:"sketches"`
	// ImportanceChunks holds each importance-sampling chunk's sums (method
	// importance; its chunks are of 128 samples), in chunk order.
	ImportanceChunks []PartRareChunk `json:"importance_chunks,omitempty"`
}

// PartRareChunk is one importance-sampling chunk's sums: counts, the
// failures of each event (the reported modes, then any), and its floating
// sums as the bits of float64 values (little-endian, base64): the weight of
// the samples outside the domain, then per event W = Σw, W2 = Σw²,
// WMax = max w and, per coordinate u of standard-normal space (Dim of
// them), WU = Σw·u, W2U = Σw²·u, W2UU = Σw²·u².
type PartRareChunk struct {
	Samples     int64   `json:"samples"`
	Evaluations int64   `json:"evaluations"`
	Invalid     int64   `json:"invalid"`
	Failed      []int64 `json:"failed"`
	Dim         int     `json:"dim"`
	Sums        string  `json:"sums"`
}

// PartSketch is one sketch's bin counts and extremes.
type PartSketch struct {
	// Counts are the bins' counts as unsigned varints (encoding/binary),
	// base64 (RFC 4648 standard encoding).
	Counts string `json:"counts"`
	Bins   int    `json:"bins"`
	Under  int64  `json:"under"`
	Over   int64  `json:"over"`
	// Extremes: under min, under max, over min, over max, lowest, highest;
	// exact decimals, or "inf"/"-inf" for an empty set.
	Extremes [6]PartFloat `json:"extremes"`
}

// PartFloat is a float64 written exactly: a JSON number, or the strings
// "inf", "-inf", "nan" for the values JSON lacks.
type PartFloat float64

// MarshalJSON writes the number exactly.
func (f PartFloat) MarshalJSON() ([]byte, error) {
	x := float64(f)
	switch {
	case math.IsInf(x, 1):
		return []byte(`"inf"`), nil
	case math.IsInf(x, -1):
		return []byte(`"-inf"`), nil
	case math.IsNaN(x):
		return []byte(`"nan"`), nil
	}
	return strconv.AppendFloat(nil, x, 'g', -1, 64), nil
}

// UnmarshalJSON reads what MarshalJSON writes.
func (f *PartFloat) UnmarshalJSON(b []byte) error {
	switch string(b) {
	case `"inf"`:
		*f = PartFloat(math.Inf(1))
	case `"-inf"`:
		*f = PartFloat(math.Inf(-1))
	case `"nan"`:
		*f = PartFloat(math.NaN())
	default:
		x, err := strconv.ParseFloat(string(b), 64)
		if err != nil {
			return fmt.Errorf("not a number: %s", b)
		}
		*f = PartFloat(x)
	}
	return nil
}

// PartSource is the scenario of a part with the text it was parsed from.
type PartSource struct {
	Scenario *scenario.Scenario
	Name     string // name given to scenario.Parse
	Data     []byte
}

// NewPartDoc builds the part file of a run's part.
func NewPartDoc(command string, src PartSource, set montecarlo.Settings, method string, steps []*montecarlo.PartState, vary *PartVary, version string) PartDoc {
	d := PartDoc{SchemaVersion: SchemaVersion, Kind: "part", ToolVersion: version, PartFormat: PartFormat, Command: command,
		Scenario: Info(src.Scenario), SourceName: src.Name, Source: string(src.Data), Vary: vary,
		Settings: PartSettings{Samples: set.Samples, Seed: set.Seed, Confidence: set.Confidence, Interval: set.Interval.String(),
			Method: method, ProbabilitiesOnly: set.ProbabilitiesOnly},
		Workers: set.Workers}
	for _, m := range set.Modes {
		d.Settings.Modes = append(d.Settings.Modes, m.Key())
	}
	for _, st := range steps {
		d.Part, d.Parts = st.Part, st.Parts
		d.ElapsedSeconds += st.Elapsed.Seconds()
		d.Steps = append(d.Steps, partStep(st))
	}
	return d
}

func partStep(st *montecarlo.PartState) PartStep {
	ps := PartStep{Method: st.Method, MethodNote: st.MethodNote, FirstChunk: st.FirstChunk, EndChunk: st.EndChunk,
		Samples: st.Samples, Invalid: st.Invalid, Any: st.Any, Binned: st.Binned, BoltSamples: st.BoltSamples,
		Failures: map[string]int64{}, BoltFailures: map[string]int64{}, BinStride: st.BinStride,
		ChunkSums: make([][3]float64, len(st.Chunks)), Sketches: []PartSketch{}}
	for m := range model.NumModes {
		if st.Fail[m] != 0 {
			ps.Failures[m.Key()] = st.Fail[m]
		}
		if st.BoltFail[m] != 0 {
			ps.BoltFailures[m.Key()] = st.BoltFail[m]
		}
	}
	for i, c := range st.Chunks {
		ps.ChunkSums[i] = [3]float64{c.N, c.Sum, c.SSQ}
	}
	for ci := range st.CaseFail {
		m := map[string]int64{}
		for mode, n := range st.CaseFail[ci] {
			if n != 0 {
				m[model.Mode(mode).Key()] = n
			}
		}
		ps.CaseFailures = append(ps.CaseFailures, m)
	}
	ps.CaseAny = st.CaseAny
	for _, c := range st.Rare {
		rc := PartRareChunk{Samples: c.Samples, Evaluations: c.Evaluations, Invalid: c.Invalid, Failed: []int64{}}
		buf := binary.LittleEndian.AppendUint64(nil, math.Float64bits(c.InvalidW))
		for _, e := range c.Events {
			rc.Failed = append(rc.Failed, e.Failed)
			rc.Dim = len(e.WU)
			for _, x := range [3]float64{e.W, e.W2, e.WMax} {
				buf = binary.LittleEndian.AppendUint64(buf, math.Float64bits(x))
			}
			for _, v := range [3][]float64{e.WU, e.W2U, e.W2UU} {
				for _, x := range v {
					buf = binary.LittleEndian.AppendUint64(buf, math.Float64bits(x))
				}
			}
		}
		rc.Sums = base64.StdEncoding.EncodeToString(buf)
		ps.ImportanceChunks = append(ps.ImportanceChunks, rc)
	}
	for _, sk := range st.Sketches {
		var buf []byte
		for _, c := range sk.Counts {
			buf = binary.AppendUvarint(buf, uint64(c))
		}
		ps.Sketches = append(ps.Sketches, PartSketch{Counts: base64.StdEncoding.EncodeToString(buf), Bins: len(sk.Counts),
			Under: sk.Under, Over: sk.Over,
			Extremes: [6]PartFloat{PartFloat(sk.UnderMin), PartFloat(sk.UnderMax), PartFloat(sk.OverMin), PartFloat(sk.OverMax), PartFloat(sk.Lowest), PartFloat(sk.Highest)}})
	}
	return ps
}

// EncodePart returns the part file's bytes, with its checksum.
func EncodePart(d PartDoc) ([]byte, error) {
	d.Checksum = ""
	b, err := json.Marshal(d)
	if err != nil {
		return nil, err
	}
	sum := sha256.Sum256(b)
	d.Checksum = hex.EncodeToString(sum[:])
	out, err := json.Marshal(d)
	return append(out, '\n'), err
}

// DecodePart reads a part file; errors name the file and what is wrong.
func DecodePart(file string, data []byte) (*PartDoc, error) {
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, fmt.Errorf("%s: the file is empty; a part file is the JSON written by 'simulate --part K/N'", file)
	}
	var d PartDoc
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&d); err != nil {
		if errors.Is(err, io.ErrUnexpectedEOF) {
			return nil, fmt.Errorf("%s: truncated part file (%v): the part did not finish writing or the copy was cut; run the part again", file, err)
		}
		return nil, fmt.Errorf("%s: not a part file (%v)", file, err)
	}
	if d.Kind != "part" {
		return nil, fmt.Errorf("%s: a %q document, not a part file (kind \"part\")", file, d.Kind)
	}
	if d.PartFormat != PartFormat {
		return nil, fmt.Errorf("%s: part format %d; this boltrisk reads part format %d (run every part and the merge with one version)", file, d.PartFormat, PartFormat)
	}
	want := d.Checksum
	d.Checksum = ""
	b, err := json.Marshal(d)
	if err != nil {
		return nil, fmt.Errorf("%s: %v", file, err)
	}
	sum := sha256.Sum256(b)
	if hex.EncodeToString(sum[:]) != want {
		return nil, fmt.Errorf("%s: checksum mismatch: the part file was changed or damaged after it was written; run the part again", file)
	}
	d.Checksum = want
	src := sha256.Sum256([]byte(d.Source))
	if hex.EncodeToString(src[:]) != d.Scenario.SHA256 {
		return nil, fmt.Errorf("%s: the scenario text does not match its SHA-256 %s", file, d.Scenario.SHA256)
	}
	for _, st := range d.Steps {
		if st.Method != "crude" && st.Method != "importance" {
			return nil, fmt.Errorf("%s: a part of a %s run: only crude Monte Carlo, importance sampling of a fixed sample count (and auto resolved to crude) merge exactly; %s is sequential or adaptive and runs on one machine", file, st.Method, st.Method)
		}
	}
	if d.Parts < 1 || d.Part < 1 || d.Part > d.Parts || len(d.Steps) == 0 {
		return nil, fmt.Errorf("%s: part %d of %d with %d steps: not a valid part", file, d.Part, d.Parts, len(d.Steps))
	}
	return &d, nil
}

// ScenarioOf rebuilds the part's scenario from its text.
func (d *PartDoc) ScenarioOf() (*scenario.Scenario, error) {
	s, err := scenario.Parse(d.SourceName, []byte(d.Source))
	if err != nil {
		return nil, err
	}
	if d.Scenario.File == "" {
		s.File = ""
	}
	return s, nil
}

// RunSettings returns the settings the parts ran with.
func (d *PartDoc) RunSettings(workers int) (montecarlo.Settings, error) {
	ps := d.Settings
	set := montecarlo.Settings{Samples: ps.Samples, Seed: ps.Seed, Confidence: ps.Confidence, Workers: workers, ProbabilitiesOnly: ps.ProbabilitiesOnly}
	var err error
	if set.Interval, err = interval.ParseMethod(ps.Interval); err != nil {
		return set, err
	}
	if set.Method, err = montecarlo.ParseMethod(ps.Method); err != nil {
		return set, err
	}
	for _, k := range ps.Modes {
		m, ok := model.ParseMode(k)
		if !ok {
			return set, fmt.Errorf("unknown mode %q", k)
		}
		set.Modes = append(set.Modes, m)
	}
	return set, set.Validate()
}

// States returns the part's state of every step.
func (d *PartDoc) States() ([]*montecarlo.PartState, error) {
	var out []*montecarlo.PartState
	for i, ps := range d.Steps {
		st := &montecarlo.PartState{Method: ps.Method, MethodNote: ps.MethodNote, Part: d.Part, Parts: d.Parts,
			FirstChunk: ps.FirstChunk, EndChunk: ps.EndChunk, Samples: ps.Samples, Invalid: ps.Invalid, Any: ps.Any,
			Binned: ps.Binned, BoltSamples: ps.BoltSamples, BinStride: ps.BinStride, Chunks: make([]montecarlo.ChunkSum, len(ps.ChunkSums))}
		for k, n := range ps.Failures {
			m, ok := model.ParseMode(k)
			if !ok {
				return nil, fmt.Errorf("step %d: unknown mode %q", i+1, k)
			}
			st.Fail[m] = n
		}
		for k, n := range ps.BoltFailures {
			m, ok := model.ParseMode(k)
			if !ok {
				return nil, fmt.Errorf("step %d: unknown mode %q", i+1, k)
			}
			st.BoltFail[m] = n
		}
		for j, c := range ps.ChunkSums {
			st.Chunks[j] = montecarlo.ChunkSum{N: c[0], Sum: c[1], SSQ: c[2]}
		}
		if len(ps.CaseFailures) != len(ps.CaseAny) {
			return nil, fmt.Errorf("step %d: failures of %d load cases but any-mode counts of %d", i+1, len(ps.CaseFailures), len(ps.CaseAny))
		}
		if len(ps.CaseAny) > 0 {
			st.CaseFail, st.CaseAny = make([][model.NumModes]int64, len(ps.CaseAny)), ps.CaseAny
			for ci, m := range ps.CaseFailures {
				for k, n := range m {
					mode, ok := model.ParseMode(k)
					if !ok {
						return nil, fmt.Errorf("step %d, load case %d: unknown mode %q", i+1, ci+1, k)
					}
					st.CaseFail[ci][mode] = n
				}
			}
		}
		for j, c := range ps.ImportanceChunks {
			raw, err := base64.StdEncoding.DecodeString(c.Sums)
			ne := len(c.Failed)
			if err != nil || c.Dim < 0 || len(raw) != 8*(1+ne*(3+3*c.Dim)) {
				return nil, fmt.Errorf("step %d, importance chunk %d: the sums are not %d events × %d coordinates", i+1, j+1, ne, c.Dim)
			}
			next := func() float64 {
				x := math.Float64frombits(binary.LittleEndian.Uint64(raw))
				raw = raw[8:]
				return x
			}
			vec := func() []float64 {
				v := make([]float64, c.Dim)
				for k := range v {
					v[k] = next()
				}
				return v
			}
			rc := rare.ChunkSums{Samples: c.Samples, Evaluations: c.Evaluations, Invalid: c.Invalid, InvalidW: next()}
			for _, f := range c.Failed {
				e := rare.EventSums{Failed: f, W: next(), W2: next(), WMax: next()}
				e.WU, e.W2U, e.W2UU = vec(), vec(), vec()
				rc.Events = append(rc.Events, e)
			}
			if j > 0 && (len(rc.Events) != len(st.Rare[0].Events) || c.Dim != len(st.Rare[0].Events[0].WU)) {
				return nil, fmt.Errorf("step %d, importance chunk %d: %d events × %d coordinates, chunk 1 differs", i+1, j+1, ne, c.Dim)
			}
			st.Rare = append(st.Rare, rc)
		}
		for j, sk := range ps.Sketches {
			raw, err := base64.StdEncoding.DecodeString(sk.Counts)
			if err != nil {
				return nil, fmt.Errorf("step %d, sketch %d: %v", i+1, j+1, err)
			}
			ss := montecarlo.SketchState{Counts: make([]int64, sk.Bins), Under: sk.Under, Over: sk.Over,
				UnderMin: float64(sk.Extremes[0]), UnderMax: float64(sk.Extremes[1]), OverMin: float64(sk.Extremes[2]),
				OverMax: float64(sk.Extremes[3]), Lowest: float64(sk.Extremes[4]), Highest: float64(sk.Extremes[5])}
			for b := range ss.Counts {
				v, n := binary.Uvarint(raw)
				if n <= 0 || v > math.MaxInt64 {
					return nil, fmt.Errorf("step %d, sketch %d: bin counts end after %d of %d bins", i+1, j+1, b, sk.Bins)
				}
				ss.Counts[b], raw = int64(v), raw[n:]
			}
			if len(raw) != 0 {
				return nil, fmt.Errorf("step %d, sketch %d: %d bytes after the %d bins", i+1, j+1, len(raw), sk.Bins)
			}
			st.Sketches = append(st.Sketches, ss)
		}
		out = append(out, st)
	}
	return out, nil
}

// PartSet is a checked set of part files of one run.
type PartSet struct {
	Files   []string
	Docs    []*PartDoc
	Missing []int // part indices not given
}

// CheckParts checks that part files belong to one run: the same command,
// scenario (SHA-256), seed, settings, swept input, tool version (also the
// merging tool's) and number of parts; no part given twice; no part missing
// unless allowMissing. Each error names the files.
func CheckParts(files []string, docs []*PartDoc, version string, allowMissing bool) (*PartSet, error) {
	if len(docs) == 0 {
		return nil, fmt.Errorf("no part files given")
	}
	ref, rf := docs[0], files[0]
	seen := map[int]string{}
	for i, d := range docs {
		f := files[i]
		switch {
		case d.ToolVersion != version:
			return nil, fmt.Errorf("%s was written by boltrisk %s; this is boltrisk %s: run every part and the merge with one version", f, d.ToolVersion, version)
		case d.Command != ref.Command:
			return nil, fmt.Errorf("%s is a part of %s, %s of %s: parts of different commands", f, d.Command, rf, ref.Command)
		case d.Scenario.SHA256 != ref.Scenario.SHA256:
			return nil, fmt.Errorf("%s and %s are parts of different scenarios (sha256 %.12s… and %.12s…)", f, rf, d.Scenario.SHA256, ref.Scenario.SHA256)
		case d.Settings.Seed != ref.Settings.Seed:
			return nil, fmt.Errorf("%s and %s ran with different seeds (%d and %d)", f, rf, d.Settings.Seed, ref.Settings.Seed)
		case !samePartSettings(d.Settings, ref.Settings):
			return nil, fmt.Errorf("%s and %s ran with different settings (%+v and %+v)", f, rf, d.Settings, ref.Settings)
		case !sameVary(d.Vary, ref.Vary):
			return nil, fmt.Errorf("%s and %s sweep different inputs or grids", f, rf)
		case d.Parts != ref.Parts:
			return nil, fmt.Errorf("%s is part %d of %d, %s part %d of %d: splits into different numbers of parts", f, d.Part, d.Parts, rf, ref.Part, ref.Parts)
		}
		if g, dup := seen[d.Part]; dup {
			return nil, fmt.Errorf("part %d of %d given twice: %s and %s", d.Part, d.Parts, g, f)
		}
		seen[d.Part] = f
	}
	ps := &PartSet{Files: files, Docs: docs}
	for k := 1; k <= ref.Parts; k++ {
		if _, ok := seen[k]; !ok {
			ps.Missing = append(ps.Missing, k)
		}
	}
	if len(ps.Missing) > 0 && !allowMissing {
		return nil, fmt.Errorf("%d of %d parts missing (K = %s); give every part-K-of-%d.json, or --allow-missing for a partial result", len(ps.Missing), ref.Parts, RangeList(ps.Missing), ref.Parts)
	}
	return ps, nil
}

func samePartSettings(a, b PartSettings) bool {
	return a.Samples == b.Samples && a.Seed == b.Seed && a.Confidence == b.Confidence && a.Interval == b.Interval &&
		a.Method == b.Method && strings.Join(a.Modes, ",") == strings.Join(b.Modes, ",") && a.ProbabilitiesOnly == b.ProbabilitiesOnly
}

func sameVary(a, b *PartVary) bool {
	if a == nil || b == nil {
		return a == b
	}
	return *a == *b
}

// RangeList writes sorted indices as ranges: 1, 3-5, 9.
func RangeList(ks []int) string {
	var parts []string
	for i := 0; i < len(ks); {
		j := i
		for j+1 < len(ks) && ks[j+1] == ks[j]+1 {
			j++
		}
		if j > i {
			parts = append(parts, fmt.Sprintf("%d-%d", ks[i], ks[j]))
		} else {
			parts = append(parts, strconv.Itoa(ks[i]))
		}
		i = j + 1
	}
	return strings.Join(parts, ", ")
}

// JSONSchema describes a PartFloat: a number or one of "inf", "-inf", "nan".
func (PartFloat) JSONSchema() *jsonschema.Schema {
	return &jsonschema.Schema{OneOf: []*jsonschema.Schema{{Type: "number"}, {Type: "string", Enum: []any{"inf", "-inf", "nan"}}}}
}
