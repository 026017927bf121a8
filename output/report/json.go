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
	// Rails is the power tree (see Table.Rails), and OffRail how many
	// parts it does not reach; omitted when the design has no supply.
	Rails   []*jsonSupply `json:"rails,omitempty"`
	OffRail int           `json:"off_rail,omitempty"`
}

// jsonSupply is one supply in the power tree. Figures the circuit does not
// fix read 0 and are listed in undetermined; a supply whose flow could not
// be judged has judged false and its figures read 0.
type jsonSupply struct {
	Name      string `json:"name"`
	Kind      string `json:"kind"`
	Rail      string `json:"rail"`
	Reference string `json:"reference"`
	Judged    bool   `json:"judged"`
	// Voltage is the rail's, Current and Power what the supply delivers
	// into it.
	Voltage float64 `json:"voltage"`
	Current float64 `json:"current"`
	Power   float64 `json:"power"`
	// Use and Limit as for a part: its worst rating, null without one.
	Use   *float64 `json:"use"`
	Limit *string  `json:"limit"`
	// Input is the rail it draws from, null for a supply that draws from
	// none; Taken the power it converts (from its input, or of its own),
	// Loss what it dissipates, Efficiency Power ÷ Taken (null when it
	// converts nothing).
	Input        *jsonInput `json:"input"`
	Taken        float64    `json:"taken"`
	Loss         float64    `json:"loss"`
	Efficiency   *float64   `json:"efficiency"`
	Undetermined []string   `json:"undetermined,omitempty"`
	// Region is the state a regulator or converter settled in
	// ("regulating", "dropout", "current limit"); omitted for others.
	Region string `json:"region,omitempty"`
	// ListedUnder names the supply that lists the parts of a rail shared
	// with it; Repeated marks a supply met again round a loop of supplies
	// (drawn in full where it first appears), InLoop where a loop is
	// first drawn.
	ListedUnder string        `json:"listed_under,omitempty"`
	Repeated    bool          `json:"repeated,omitempty"`
	InLoop      bool          `json:"in_loop,omitempty"`
	Feeds       []*jsonSupply `json:"feeds"`
	Loads       []jsonLoad    `json:"loads"`
}

type jsonInput struct {
	Rail    string  `json:"rail"`
	Current float64 `json:"current"`
	Power   float64 `json:"power"`
	// Fed is false when no supply drives the input's net.
	Fed bool `json:"fed"`
}

// jsonLoad is a part on a rail: the current it takes there, its own power.
type jsonLoad struct {
	Name         string   `json:"name"`
	Kind         string   `json:"kind"`
	Current      float64  `json:"current"`
	Power        float64  `json:"power"`
	Towards      []string `json:"towards,omitempty"`
	Use          *float64 `json:"use"`
	Limit        *string  `json:"limit"`
	Undetermined []string `json:"undetermined,omitempty"`
	// Net is the net the tree follows the part's current on to, with the
	// supplies fed from it and the other parts on it; omitted when the
	// tree stops at the part.
	Net   string        `json:"net,omitempty"`
	Feeds []*jsonSupply `json:"feeds,omitempty"`
	Loads []jsonLoad    `json:"loads,omitempty"`
}

// jsonUse returns a use and its rating's key, or nils.
func jsonUse(u Rating, ok bool) (*float64, *string) {
	if !ok {
		return nil, nil
	}
	f, k := round(u.Frac), key(u.What)
	return &f, &k
}

// unknowns lists the values a voltage and a current the circuit does not
// fix leave open.
func unknowns(v, c bool) []string {
	var out []string
	if v {
		out = append(out, "voltage")
	}
	if c {
		out = append(out, "current")
	}
	if v || c {
		out = append(out, "power")
	}
	return out
}

func railJSON(s *Supply) *jsonSupply {
	f := &s.Flow
	j := &jsonSupply{Name: s.Name, Kind: s.Kind.String(), Rail: s.Rail, Reference: s.Ref, Judged: s.Judged,
		ListedUnder: s.Alongside, Repeated: s.Loop, InLoop: s.InLoop, Feeds: []*jsonSupply{}, Loads: []jsonLoad{}}
	if s.Judged {
		j.Voltage, j.Current, j.Power = round(f.VOut), round(f.IOut), round(f.POut)
		j.Taken, j.Loss = round(f.Taken), round(f.Loss)
		if f.HasEfficiency {
			e := round(f.Efficiency)
			j.Efficiency = &e
		}
		j.Undetermined = unknowns(f.VoltageUnknown, f.CurrentUnknown)
		if f.HasRegion {
			j.Region = f.Region.String()
		}
	}
	if s.Input != "" {
		j.Input = &jsonInput{Rail: s.Input, Current: round(f.IIn), Power: round(f.PIn), Fed: !s.Unfed}
	}
	j.Use, j.Limit = jsonUse(s.Use, s.HasUse)
	for _, c := range s.Feeds {
		j.Feeds = append(j.Feeds, railJSON(c))
	}
	for _, l := range s.Loads {
		j.Loads = append(j.Loads, loadJSON(l))
	}
	return j
}

func loadJSON(l *Load) jsonLoad {
	j := jsonLoad{Name: l.Name, Kind: l.Kind.String(), Current: round(l.Current), Power: round(l.Power),
		Towards: l.Towards, Undetermined: unknowns(l.VoltageUnknown, l.CurrentUnknown), Net: l.Net}
	j.Use, j.Limit = jsonUse(l.Use, l.HasUse)
	for _, c := range l.Feeds {
		j.Feeds = append(j.Feeds, railJSON(c))
	}
	for _, c := range l.Loads {
		j.Loads = append(j.Loads, loadJSON(c))
	}
	return j
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
	// DriveRange is a port's drive range [LOW, HIGH] (V or A), whose
	// middle the operating point takes; omitted for other parts.
	DriveRange *[2]float64 `json:"drive_range,omitempty"`
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
		if r := p.DriveRange; r != nil {
			jp.DriveRange = &[2]float64{round(r[0]), round(r[1])}
		}
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
	for _, s := range t.Rails {
		doc.Rails = append(doc.Rails, railJSON(s))
	}
	if doc.Rails != nil {
		doc.OffRail = t.OffRail
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(doc)
}
