package report

import (
	"encoding/json"

	"github.com/invopop/jsonschema"

	"boltrisk/montecarlo/scenario"
)

// Documents are the JSON documents by kind, for their schemas.
var Documents = map[string]any{
	"nominal":  NominalDoc{},
	"simulate": SimDoc{},
	"part":     PartDoc{},
	"rank":     RankDoc{},
	"sweep":    SweepDoc{},
	"compare":  CompareDoc{},
	"spec":     SpecDoc{},
	"drivers":  DriversDoc{},
	"fit":      FitDoc{},
	"life":     LifeDoc{},
}

// GenerateSchemas returns the JSON Schema of every document (reflected from
// the Go types, descriptions from their doc comments read in srcDir, the
// folder of this package's source) and of the scenario file, by name.
func GenerateSchemas(srcDir string) (map[string][]byte, error) {
	r := &jsonschema.Reflector{ExpandedStruct: true}
	if err := r.AddGoComments("boltrisk/montecarlo/report", srcDir); err != nil {
		return nil, err
	}
	out := map[string][]byte{}
	for name, doc := range Documents {
		s := r.Reflect(doc)
		s.ID = jsonschema.ID("boltrisk/" + name + ".schema.json")
		s.Title = "boltrisk " + name + " document"
		b, err := json.MarshalIndent(s, "", "  ")
		if err != nil {
			return nil, err
		}
		out[name] = append(b, '\n')
	}
	b, err := json.MarshalIndent(scenario.Schema(), "", "  ")
	if err != nil {
		return nil, err
	}
	out["scenario"] = append(b, '\n')
	return out, nil
}
