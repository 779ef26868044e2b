package main

import (
	"fmt"
	"sort"
	"strings"
	"unicode/utf8"

	"loopwise/lang"
	"loopwise/runtime"
)

const generalHelp = `Loopwise evaluates statements with units.

Statements
  gap = 4 mm                     assign a name
  coil: mm = 12.5 mm             assign and declare the unit it must keep (and is shown in)
  I(t) = 20 A * sin(2*pi*50 Hz*t)  define a function (it sees current values of other names)
  I(2.5 ms)                      show a value, in the best SI prefix
  flux as uWb                    show a value in a chosen unit
  x = 3 mm*4 mm as mm^2          assign, and show it in a unit
  // text after two slashes is a comment

Numbers and units
  A unit follows a number, with or without a space: 5 mT, 3 A/ms, 2 kg*m^2/s^2.
  Compound units are written without spaces; a space ends the unit (2 m * s
  multiplies by a name s). Prefixes q r y z a f p n u µ m c d da h k M G T P E
  Z Y R Q; u = micro. A unit after ) or ] scales that bracket:
  10 V / (3 + 4j) ohm is 10 V over (3 + 4j) ohm.
  Angles are a dimension: 90 deg, 1 rev (2π rad), 3000 rpm (314.159 rad/s).
  Hz counts cycles: (50 Hz * 1 rev) as rad/s is the angular frequency;
  2*pi*f is a rate in s^-1. sin, cos, tan take an angle or radians.
  20 °C (or degC) is the absolute temperature 293.15 K.
  12 mm ± 0.1 mm (or +-) carries a standard uncertainty, 2 A ± 2 % a
  relative one, through every later result; see :help sensitivity and
  :help monte_carlo.
  Vectors: [0, 0, 5] mm, with + - * / by scalars, dot, cross, norm, .x .y .z.
  Operators: + - * / % ^ (power, from the right: 2^3^2 = 512), comparisons
  == != < <= > >=, and/or/not.

Commands
  :help [name]    this text, or help on a builtin, constant, unit or variable
  :vars           list your variables and functions
  :units [text]   list the units (optionally only those matching text)
  :digits N       show N significant digits (default 6)
  :numerr on|off  show every numerical error estimate beside its value (off:
                  only those that reach the digits shown)
  :budget S       the work one statement may do, in seconds (default 5; run,
                  check and record: 60, or -budget S); work estimated to need
                  more is refused before it starts
  :save FILE      save this session as a script that replays (statements and
                  results) in a new file; :save! FILE replaces an existing one
  :load FILE      evaluate a script into this session
  :quit           leave (Ctrl-D also leaves; Ctrl-C clears the line, and
                  stops a statement that is running)
  A statement continues on the next line while a bracket ( [ { is open; the
  prompt then shows "..  " and Ctrl-C drops the whole statement.

Scripts
  A script is a Markdown file; statements sit in blocks fenced by a line
  ` + "```lw" + ` and a line ` + "```" + `, each followed by its recorded result on a
  line starting with ↳ (a table's rows follow behind │, cautions behind ↳ ⚠).
  loopwise run/check/record FILE replay them.

Induction
  Build paths (circle, rings, helix, polygon, …), give them currents with
  source(path, I), then ask for b_at, flux, emf, mutual, inductance, force,
  e_at, and more; :help NAME explains each with its method and accuracy.
  Functions are values: I(t) = … makes a current that changes in time,
  F(p) = … a vector field of position for line_integral, curl and div.

Safety
  Results above extra-low voltage, high induction-heating power densities
  and exposure_check results above ICNIRP 2010 levels carry a caution.
  Induced voltages, induction heating and strong magnetic fields can injure.
  Loopwise computes numbers; it does not replace local electrical codes,
  exposure limits or the judgement of a licensed professional.
`

func (c *console) help(st *lang.Statement) {
	arg := strings.TrimSpace(st.Args)
	if arg == "" {
		fmt.Fprint(c.out, generalHelp)
		c.listBuiltins()
		return
	}
	if h, ok := c.s.HelpFor(arg); ok {
		c.showHelp(arg, h)
		return
	}
	if v, ok := c.s.Lookup(arg); ok {
		fmt.Fprintf(c.out, "%s is your variable: %s\n", arg, runtime.Format(v, c.s.Digits))
		return
	}
	if u, err := runtime.ParseUnit(arg); err == nil {
		if u.Dim.IsZero() {
			fmt.Fprintf(c.out, "%s is a dimensionless unit of size %s\n", arg, siSize(u))
		} else {
			fmt.Fprintf(c.out, "%s is a unit: 1 %s = %s, a unit of %s\n", arg, arg,
				siSize(u), u.Dim.Describe())
		}
		for _, d := range runtime.Catalogue() {
			if d.Sym == arg {
				fmt.Fprintf(c.out, "  %s; defined by %s\n", d.Name, d.Defined)
			}
		}
		return
	}
	// an unknown name is a failed line, like any other mistake
	lead := utf8.RuneCountInString(st.Text) - utf8.RuneCountInString(strings.TrimLeft(st.Text, " \t"))
	c.fail(st.Errorf(lead, utf8.RuneCountInString(strings.TrimSpace(st.Text)), "no help for %q; :help lists the builtins, :units the units", lang.Abbrev(arg, 40)))
}

func (c *console) showHelp(name string, h *runtime.Help) {
	fmt.Fprintf(c.out, "%s\n%s\n", h.Signature, c.wrap("  ", h.Summary))
	if h.Method != "" {
		fmt.Fprintf(c.out, "%s\n", c.wrap("  ", "method: "+h.Method))
	}
	if h.Example != "" {
		fmt.Fprint(c.out, "  example:\n")
		lines, shown, failed := runExample(h.Example, c.s.InDir)
		for _, l := range lines {
			fmt.Fprintf(c.out, "    %s\n", l)
		}
		mark := runtime.ResultMark
		if failed {
			mark = "✗"
		}
		for i, l := range shown {
			if i == 0 {
				fmt.Fprintf(c.out, "    %s %s\n", mark, l)
			} else {
				fmt.Fprintf(c.out, "      %s\n", l)
			}
		}
	}
	if h.Reference != "" {
		fmt.Fprintf(c.out, "%s\n", c.wrap("  ", "reference: "+h.Reference))
	}
}

// runExample pastes a help example, one statement per line, into a
// scratch console (the user's names are untouched) and returns its lines and
// what the console printed for the last one, as a user would see it. Data
// files are read from inDir, as the user's console would.
func runExample(example, inDir string) (lines, shown []string, failed bool) {
	lines = strings.Split(example, "\n")
	var out, errOut strings.Builder
	scratch := newConsole(&out, &errOut)
	scratch.s.InDir = inDir
	for i, l := range lines {
		if i == len(lines)-1 {
			out.Reset()
		}
		scratch.line(l)
	}
	text := strings.TrimRight(out.String(), "\n")
	if errOut.Len() > 0 {
		text, failed = strings.TrimRight(errOut.String(), "\n"), true
	}
	return lines, strings.Split(text, "\n"), failed
}

func (c *console) listBuiltins() {
	lib := c.s.Library()
	var order []string
	byFamily := map[string][]string{}
	for _, f := range lib.Funcs {
		fam := f.Help.Family
		if _, seen := byFamily[fam]; !seen {
			order = append(order, fam)
		}
		byFamily[fam] = append(byFamily[fam], f.Name)
	}
	var cs []string
	for _, k := range lib.Consts {
		cs = append(cs, k.Name)
	}
	fmt.Fprintln(c.out, "\nBuiltins (:help NAME for one):")
	for _, fam := range order {
		names := byFamily[fam]
		sort.Strings(names)
		fmt.Fprintf(c.out, "  %-21s %s\n", fam+":", strings.Join(names, " "))
	}
	fmt.Fprintf(c.out, "Constants: %s\n", strings.Join(cs, " "))
}

// siSize writes the size of a unit in the coherent SI unit of its dimension.
func siSize(u runtime.UnitExpr) string {
	if u.Offset != 0 {
		// °C: a shifted scale
		return runtime.FormatNumber(u.Scale()+u.Offset, 12) + " K (t °C is t + " + runtime.FormatNumber(u.Offset, 12) + " K)"
	}
	if u.Dim.IsZero() {
		return runtime.FormatNumber(u.Scale(), 12)
	}
	return runtime.FormatNumber(u.Scale(), 12) + " " + runtime.DisplayUnitOf(u.Dim)
}

// wrap indents text and, on a terminal, breaks it at spaces to the
// console's width, continuing lines two columns further in. The standard
// library has no word wrap; this is the few lines it takes.
func (c *console) wrap(indent, text string) string {
	if c.width == 0 {
		return indent + text
	}
	var b strings.Builder
	line, col := indent, utf8.RuneCountInString(indent)
	for i, w := range strings.Fields(text) {
		n := utf8.RuneCountInString(w)
		if i > 0 && col+1+n > c.width-1 {
			b.WriteString(line + "\n")
			line, col = indent+"  ", utf8.RuneCountInString(indent)+2
		} else if i > 0 {
			line += " "
			col++
		}
		line += w
		col += n
	}
	b.WriteString(line)
	return b.String()
}
