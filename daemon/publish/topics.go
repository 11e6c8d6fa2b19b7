package publish

import (
	"errors"
	"strings"
)

// topics are the contract's topic names for one frame.
type topics struct {
	status, events, live, specimens, commands, verification, resultsPrefix string
}

func newTopics(root, frame string) topics {
	base := root + "/" + frame + "/"
	return topics{
		status:        base + "status",
		events:        base + "events",
		live:          base + "live",
		specimens:     base + "specimens",
		commands:      base + "commands",
		verification:  base + "verification",
		resultsPrefix: base + "results/",
	}
}

// result is the topic of one test's result. Test ids are framed's own, but
// a level must not contain '/', '+', '#' or NUL, so those become '_' rather
// than leave a result that can never be delivered.
func (t topics) result(testID string) string {
	return t.resultsPrefix + strings.Map(func(r rune) rune {
		switch r {
		case '/', '+', '#', 0:
			return '_'
		}
		return r
	}, testID)
}

func topicLevel(s string) error {
	switch {
	case s == "":
		return errors.New("empty topic level")
	case strings.ContainsAny(s, "/+#\x00"):
		return errors.New("contains '/', '+', '#' or NUL")
	case strings.HasPrefix(s, "$"):
		return errors.New("starts with '$' (reserved for the broker)")
	}
	return nil
}
