// Package scenario reads scenario files: YAML documents that describe one
// joint, which of its inputs are uncertain, and the study settings. Every
// dimensional quantity carries its unit; every problem is reported with file,
// line, field, value and what is allowed.
package scenario

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"unicode/utf8"

	"go.yaml.in/yaml/v3"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
)

// Study holds the run settings a scenario may carry; command-line flags
// override them. Zero values mean "not set".
type Study struct {
	Samples    int64
	Seed       uint64
	SeedSet    bool
	Confidence float64
	// Precision is the stopping rule: the target coefficient of variation
	// of every reported probability.
	Precision float64
	// TargetProbability is the failure probability a design must meet.
	TargetProbability float64
}

// Scenario is a loaded, validated joint with its uncertain inputs.
type Scenario struct {
	Name        string
	Description string
	File        string // path it was read from ("" for built-in examples)
	SHA256      string // of the file's bytes
	Units       units.System

	Problem  montecarlo.Problem // nominal inputs (means of distributions) and uncertain ones
	Study    Study
	Warnings []model.Warning

	// Sources says where each input's value came from when the file did
	// not give it: a property class, a preset, a default (path → text).
	Sources map[string]string

	ClassName     string // property class used, "" if strengths were given
	ConditionName string // assembly-condition preset, "" if none
	ToolName      string // tightening-tool preset, "" if none
	EnduranceNote string // where the endurance strength came from

	// Roughness is the mean roughness Rz of the faces in the joint, mm
	// (members.roughness; 0: not given). It chooses the row of the embedding
	// estimate (VDI 2230-1 Table 5).
	Roughness float64
	// Data lists the inputs fitted to test data at load time (data.go).
	Data []DataSource
	// Life is the service-life problem (fatigue.curve, fatigue.design_life,
	// loads.spectrum); nil when the file gives no curve.
	Life *montecarlo.LifeSpec
	// given holds the registry paths the file sets.
	given map[string]bool

	Variants []*Scenario // named variants (compare); each is a complete scenario
	Variant  string      // this scenario's variant name, "" for the base

	// Bytes is the file's bytes, verbatim (for the report's appendix).
	Bytes []byte
	// raw and parser rebuild the scenario with changed keys (Alternative).
	raw    rawDoc
	parser *parser
}

// Inputs returns the nominal model inputs.
func (s *Scenario) Inputs() *model.Inputs { return &s.Problem.Base }

// Uncertain returns the uncertain input bound to path, if any.
func (s *Scenario) Uncertain(path string) (*montecarlo.Var, bool) {
	i, ok := s.Problem.VarIndex(path)
	if !ok {
		return nil, false
	}
	return &s.Problem.Vars[i], true
}

// Load reads and validates a scenario file.
func Load(path string) (*Scenario, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("cannot read scenario: %w", err)
	}
	return parse(path, data, filepath.Dir(path))
}

// Parse validates a scenario held in memory; name is used in messages.
// Data files it references are read relative to the working folder.
func Parse(name string, data []byte) (*Scenario, error) { return parse(name, data, "") }

// parse reads a scenario whose data files lie relative to dir.
func parse(name string, data []byte, dir string) (*Scenario, error) {
	p := &parser{file: name, dir: dir}
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, p.errf(0, "", "", "the file is empty; a scenario needs at least bolt, members and tightening")
	}
	if bytes.IndexByte(data, 0) >= 0 || !utf8.Valid(data) {
		return nil, p.errf(0, "", "", "the file is not text (binary data or invalid UTF-8); a scenario is a YAML document")
	}
	var doc yaml.Node
	dec := yaml.NewDecoder(bytes.NewReader(data))
	if err := dec.Decode(&doc); err != nil {
		if errors.Is(err, io.EOF) {
			return nil, p.errf(0, "", "", "the file holds no YAML document; a scenario needs at least bolt, members and tightening")
		}
		return nil, p.errf(0, "", "", "not valid YAML: %s", strings.TrimPrefix(err.Error(), "yaml: "))
	}
	var second yaml.Node
	if err := dec.Decode(&second); !errors.Is(err, io.EOF) {
		line := 0
		if err == nil {
			line = second.Line
		}
		return nil, p.errf(line, "", "", "the file holds a second YAML document (after a '---' line); a scenario is one document — remove it or split the file")
	}
	if len(doc.Content) == 0 || doc.Content[0].Kind != yaml.MappingNode {
		line := 0
		if len(doc.Content) > 0 {
			line = doc.Content[0].Line
		}
		return nil, p.errf(line, "", "", "a scenario is a YAML mapping of sections (bolt:, members:, tightening:, …)")
	}
	raw, err := p.flatten(doc.Content[0])
	if err != nil {
		return nil, err
	}
	s, err := p.build(raw)
	if err != nil {
		return nil, err
	}
	sum := sha256.Sum256(data)
	s.SHA256 = hex.EncodeToString(sum[:])
	s.Bytes = data
	for _, v := range s.Variants {
		v.SHA256 = s.SHA256
	}
	return s, nil
}
