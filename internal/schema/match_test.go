package schema

import "regexp"

func match(pattern, s string) bool { return regexp.MustCompile(pattern).MatchString(s) }
