package assess

import (
	"encoding/json"
	"strings"
	"testing"
)

func TestUnrequiredLogReductionIsNullInJSON(t *testing.T) {
	// The SI demo enters M. paratuberculosis without a required log
	// reduction (reported, not judged: docs/METHOD.md §9.5) and Listeria with
	// 5. JSON must not say "required 0" or "pass" for the first. Source of
	// the expected values: the demo file's own entries.
	p := load(t, string(mustRead(t, "../../testdata/demo/htst-milk-si.yaml")))
	res, err := Run(p)
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(res.Lethality)
	if err != nil {
		t.Fatal(err)
	}
	var got []map[string]any
	if err := json.Unmarshal(b, &got); err != nil {
		t.Fatal(err)
	}
	if len(got) != 2 {
		t.Fatalf("%d organisms", len(got))
	}
	map0, listeria := got[0], got[1]
	if v, ok := map0["required_log_reduction"]; !ok || v != nil || map0["judged"] != false || map0["pass"] != nil {
		t.Errorf("unrequired: required %v (present %v), judged %v, pass %v; want null, false, null",
			v, ok, map0["judged"], map0["pass"])
	}
	if listeria["required_log_reduction"] != 5.0 || listeria["judged"] != true || listeria["pass"] != true {
		t.Errorf("Listeria: %v", listeria)
	}
	if strings.Contains(string(b), `"required_log_reduction":0`) {
		t.Errorf("a required log reduction of 0 for one not required: %s", b)
	}
}
