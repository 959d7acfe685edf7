package scenario

import (
	"bufio"
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestBadFiles loads every file of testdata/bad: each is a scenario that
// must be refused. Its leading "# want: …" lines give the texts the message
// must hold (field, value, the allowed range in the file's units).
func TestBadFiles(t *testing.T) {
	t.Parallel()
	files, err := filepath.Glob(filepath.Join("testdata", "bad", "*.yaml"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no files in testdata/bad (%v)", err)
	}
	for _, path := range files {
		t.Run(strings.TrimSuffix(filepath.Base(path), ".yaml"), func(t *testing.T) {
			t.Parallel()
			data, err := os.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			var wants []string
			sc := bufio.NewScanner(bytes.NewReader(data))
			for sc.Scan() {
				line := sc.Text()
				if !strings.HasPrefix(line, "# want: ") {
					break
				}
				wants = append(wants, strings.TrimPrefix(line, "# want: "))
			}
			if len(wants) == 0 {
				t.Fatal("the file names no expected message (# want: … on its first lines)")
			}
			s, err := parse(path, data, filepath.Dir(path)) // as Load: data files beside the scenario
			if err == nil {
				t.Fatalf("accepted; want an error mentioning %q", wants)
			}
			if s != nil {
				t.Error("a scenario returned together with an error")
			}
			msg := err.Error()
			for _, w := range wants {
				if !strings.Contains(msg, w) {
					t.Errorf("message %q does not mention %q", msg, w)
				}
			}
			if !strings.HasPrefix(msg, path) {
				t.Errorf("message %q does not name the file", msg)
			}
			for _, internal := range []string{"N*mm", "N·mm"} {
				if strings.Contains(msg, internal) {
					t.Errorf("message %q uses the internal unit %s", msg, internal)
				}
			}
		})
	}
}
