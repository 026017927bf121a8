package report

import (
	"encoding/json"
	"io"
	"strings"
)

type jsonDoc struct {
	File   string     `json:"file"`
	Design string     `json:"design,omitempty"`
	Title  string     `json:"title,omitempty"`
	Nets   []jsonNet  `json:"nets"`
	Parts  []jsonPart `json:"parts"`
	// Groups are the groups of ideal shorts in parallel, with the current
	// they carry together; omitted when there are none.
	Groups []jsonGroup `json:"groups,omitempty"`
}

type jsonNet struct {
	Name    string  `json:"name"`
	Voltage float64 `json:"voltage"`
	// Undetermined is set for a net with no DC path to ground.
	Undetermined bool `json:"undetermined,omitempty"`
	// Low and High are the net's range over tolerances and temperature;
	// omitted when the design has none.
	Low  *float64 `json:"low,omitempty"`
	High *float64 `json:"high,omitempty"`
}

type jsonGroup struct {
	Parts   []string `json:"parts"`
	Current float64  `json:"current"`
}

type jsonPart struct {
	Name    string             `json:"name"`
	Kind    string             `json:"kind"`
	Voltage float64            `json:"voltage"`
	Current float64            `json:"current"`
	Power   float64            `json:"power"`
	Ratings map[string]float64 `json:"ratings"`
	Use     *float64           `json:"use"`
	// Limit names the rating the use is of ("power", "current", "voltage"
	// or "reverse_voltage"); null with use.
	Limit *string `json:"limit"`
	// Undetermined lists the values the circuit does not fix ("voltage",
	// "current", "power"), which read 0; omitted when there are none.
	Undetermined []string `json:"undetermined,omitempty"`
	// Capacity (C) and Runtime (s) of a battery; see Part.
	Capacity float64 `json:"capacity,omitempty"`
	Runtime  float64 `json:"runtime,omitempty"`
	// WorstUse is the largest use of any rating over tolerances and
	// temperature, and WorstAt the corner that reaches it; omitted when
	// the design has no worst case.
	WorstUse *float64 `json:"worst_use,omitempty"`
	WorstAt  string   `json:"worst_at,omitempty"`
}

// key is a rating's name as a JSON key: "reverse voltage" → "reverse_voltage".
func key(what string) string { return strings.ReplaceAll(what, " ", "_") }

// WriteJSON writes the table as one JSON document: SI base units as plain
// numbers (volts, amperes, watts), rounded to ten significant figures;
// ratings keyed "power", "current", "voltage", "reverse_voltage" and
// "discharge_current" (a battery's); capacity and runtime for a battery; use
// the largest fraction of any rating, null when the part has none.
func (t *Table) WriteJSON(w io.Writer) error {
	doc := jsonDoc{File: t.File, Design: t.Design, Title: t.Title, Nets: []jsonNet{}, Parts: []jsonPart{}}
	for _, n := range t.Nets {
		jn := jsonNet{Name: n.Name, Voltage: round(n.Voltage), Undetermined: n.Undetermined}
		if n.HasRange {
			lo, hi := round(n.Low), round(n.High)
			jn.Low, jn.High = &lo, &hi
		}
		doc.Nets = append(doc.Nets, jn)
	}
	for i := range t.Parts {
		p := &t.Parts[i]
		jp := jsonPart{Name: p.Name, Kind: p.Kind.String(), Voltage: round(p.Voltage), Current: round(p.Current),
			Power: round(p.Power), Ratings: map[string]float64{}, Capacity: round(p.Capacity), Runtime: round(p.Runtime)}
		if p.HasWorst {
			u := round(p.WorstUse)
			jp.WorstUse, jp.WorstAt = &u, p.WorstAt
		}
		for _, r := range p.Ratings {
			jp.Ratings[key(r.What)] = round(r.Rating)
		}
		if u, ok := p.Use(); ok {
			u = round(u)
			k := key(p.Ratings[p.Worst].What)
			jp.Use, jp.Limit = &u, &k
		}
		if p.VoltageUnknown {
			jp.Undetermined = append(jp.Undetermined, "voltage")
		}
		if p.CurrentUnknown {
			jp.Undetermined = append(jp.Undetermined, "current")
		}
		if p.VoltageUnknown || p.CurrentUnknown {
			jp.Undetermined = append(jp.Undetermined, "power")
		}
		doc.Parts = append(doc.Parts, jp)
	}
	for _, g := range t.Groups {
		doc.Groups = append(doc.Groups, jsonGroup{Parts: g.Parts, Current: round(g.Current)})
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(doc)
}
