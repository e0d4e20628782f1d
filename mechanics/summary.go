package mechanics

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"slipfront/internal/orient"
)

// WriteSummary writes a short human-readable summary of the screening: the
// principal stresses and pore pressure, the frictional-limit check, and per
// set and in total the percentage of fractures that slip at each pressure
// increase, followed by the Caution statement.
func (sc *Screening) WriteSummary(w io.Writer) error {
	var b strings.Builder
	s := sc.Stress
	b.WriteString("Stress state (total, compression positive):\n")
	tw := tabwriter.NewWriter(&b, 0, 0, 2, ' ', 0)
	for k, p := range s.Principal() {
		trend, plunge := orient.TrendAndPlunge(p.Axis)
		fmt.Fprintf(tw, "  S%d\t%s\t%s MPa\ttrend %s°\tplunge %s°\n", k+1, p.Name,
			fixed(p.Value*toMPa, 2), fixed(trend*toDeg, 1), fixed(plunge*toDeg, 1))
	}
	tw.Flush()
	fmt.Fprintf(&b, "  pore pressure %s MPa", fixed(s.PorePressure()*toMPa, 2))
	if r := s.Regime(); r != "" {
		fmt.Fprintf(&b, "; %s regime", r)
	}
	b.WriteString("\n")
	l := sc.Limit
	verdict := "within the limit"
	if l.Exceeded {
		verdict = "EXCEEDS the limit"
	}
	fmt.Fprintf(&b, "Frictional limit for friction %s: (S1-p)/(S3-p) = %s, limit %s: %s\n",
		fixed(l.Friction, 2), fixed(l.Ratio, 3), fixed(l.Limit, 3), verdict)
	if l.Warning != "" {
		fmt.Fprintf(&b, "Warning: %s\n", l.Warning)
	}
	fmt.Fprintf(&b, "\nFractures that slip at a pore-pressure increase of (cohesion %s MPa):\n",
		fixed(sc.Criterion.Cohesion*toMPa, 2))
	tw = tabwriter.NewWriter(&b, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "set\tfractures\t")
	for _, dp := range sc.Increases {
		fmt.Fprintf(tw, "%s MPa\t", strings.TrimRight(strings.TrimRight(fixed(dp*toMPa, 3), "0"), "."))
	}
	fmt.Fprintln(tw)
	rows := append(append([]Shares(nil), sc.Sets...), sc.Total)
	for _, sh := range rows {
		fmt.Fprintf(tw, "%s\t%d\t", sh.Name, sh.Fractures)
		for _, v := range sh.FractureShare {
			fmt.Fprintf(tw, "%s%%\t", fixed(100*v, percentDecimal))
		}
		fmt.Fprintln(tw)
	}
	tw.Flush()
	fmt.Fprintf(&b, "\nCaution: %s\n", Caution)
	_, err := io.WriteString(w, b.String())
	return err
}
