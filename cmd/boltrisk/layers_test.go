package main

import (
	"os/exec"
	"strings"
	"testing"
)

// TestLayers enforces the architecture (DEVELOPERS.md): the mechanics know
// nothing of randomness, time, files or printing; the runner and the
// estimators know nothing of the file format or the writers; the pictures
// know nothing of the model.
func TestLayers(t *testing.T) {
	t.Parallel()
	out, err := exec.Command("go", "list", "-deps", "-f", "{{.ImportPath}}: {{join .Imports \" \"}}", "boltrisk/...").Output()
	if err != nil {
		t.Fatalf("go list: %v", err)
	}
	imports := map[string][]string{}
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		pkg, deps, _ := strings.Cut(line, ": ")
		if strings.HasPrefix(pkg, "boltrisk/") {
			imports[pkg] = strings.Fields(deps)
		}
	}
	deps := func(pkg string) map[string]bool { // transitive, within the module and the standard library
		seen := map[string]bool{}
		var walk func(string)
		walk = func(p string) {
			for _, d := range imports[p] {
				if !seen[d] {
					seen[d] = true
					walk(d)
				}
			}
		}
		walk(pkg)
		return seen
	}
	// A rule applies to a package and (tree set) every package below it.
	type rule struct {
		pkgPrefix string
		tree      bool
		forbidden []string
		why       string
	}
	rules := []rule{
		{"boltrisk/model", true, []string{"math/rand", "math/rand/v2", "time", "os", "io", "io/fs", "bufio", "net", "boltrisk/montecarlo", "boltrisk/plots", "github.com/spf13/cobra", "gonum.org/v1/plot"},
			"the mechanics are pure: no randomness, time, files or printing"},
	}
	runner := []string{"boltrisk/montecarlo/scenario", "boltrisk/montecarlo/report", "boltrisk/plots", "github.com/spf13/cobra", "gonum.org/v1/plot", "go.yaml.in/yaml/v3"}
	for pkg := range imports {
		if strings.HasPrefix(pkg, "boltrisk/montecarlo") && !strings.HasPrefix(pkg, "boltrisk/montecarlo/scenario") && !strings.HasPrefix(pkg, "boltrisk/montecarlo/report") {
			rules = append(rules, rule{pkg, false, runner, "the runner and the estimators know neither the file format nor the writers"})
		}
	}
	rules = append(rules, rule{"boltrisk/plots", true, []string{"boltrisk/model", "boltrisk/montecarlo"}, "pictures take plain result structs"})
	for _, r := range rules {
		for pkg := range imports {
			if !(pkg == r.pkgPrefix || r.tree && strings.HasPrefix(pkg, r.pkgPrefix+"/")) {
				continue
			}
			d := deps(pkg)
			for _, f := range r.forbidden {
				if d[f] || strings.HasPrefix(f, "boltrisk/") && hasPrefixDep(d, f+"/") {
					t.Errorf("%s depends on %s: %s", pkg, f, r.why)
				}
			}
		}
	}
}

func hasPrefixDep(d map[string]bool, prefix string) bool {
	for k := range d {
		if strings.HasPrefix(k, prefix) {
			return true
		}
	}
	return false
}
