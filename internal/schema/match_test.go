package schema

// Source: a test helper; the schema's expectations are in schema_test.go.

import "regexp"

func match(pattern, s string) bool { return regexp.MustCompile(pattern).MatchString(s) }
