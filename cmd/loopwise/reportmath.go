package main

import (
	"bytes"
	"html"
	"regexp"
	"strings"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/parser"
	"github.com/yuin/goldmark/renderer"
	"github.com/yuin/goldmark/text"
	"github.com/yuin/goldmark/util"
)

// Mathematics in the prose, $…$ inline and $$…$$ on its own, is shown as
// readable text in a style of its own: common TeX commands become the
// characters they stand for (\mu → μ, \cdot → ·, \frac{a}{b} → (a)/(b),
// digits after _ and ^ → sub- and superscript digits),
// everything else stays as written, and the TeX source is kept in the
// element's title. It is written here by hand because the goldmark math
// extensions we know of either emit markup for a script to typeset in the
// browser or run a JavaScript typesetter inside Go; the page loads no
// script and the command runs no JavaScript. Typesetting into MathML is
// left for later: readable text is honest and never blank.
//
// The dollar rules are pandoc's (tex_math_dollars): an opening $ is not
// followed by a space, a closing $ is not preceded by a space and not
// followed by a digit, so "costs $5 and $6" stays prose. Inside
// mathematics nothing is Markdown.

var kindMath = ast.NewNodeKind("Math")

// mathNode is mathematics found in the prose.
type mathNode struct {
	ast.BaseInline
	tex     string
	display bool
}

func (n *mathNode) Kind() ast.NodeKind { return kindMath }

func (n *mathNode) Dump(source []byte, level int) {
	ast.DumpHelper(n, source, level, map[string]string{"tex": n.tex}, nil)
}

type mathParser struct{}

func (mathParser) Trigger() []byte { return []byte{'$'} }

func (mathParser) Parse(parent ast.Node, block text.Reader, pc parser.Context) ast.Node {
	line, _ := block.PeekLine()
	if bytes.HasPrefix(line, []byte("$$")) {
		return parseDisplay(block)
	}
	// inline: $ then no space, up to a $ with no space before it and no
	// digit after it, on the same line
	if len(line) < 3 || line[1] == ' ' || line[1] == '\t' || line[1] == '$' {
		return nil
	}
	for i := 2; i < len(line); i++ {
		switch line[i] {
		case '\\':
			i++ // an escaped character, such as \$
		case '$':
			if line[i-1] == ' ' || line[i-1] == '\t' || (i+1 < len(line) && line[i+1] >= '0' && line[i+1] <= '9') {
				continue
			}
			block.Advance(i + 1)
			return &mathNode{tex: string(line[1:i])}
		}
	}
	return nil
}

// parseDisplay reads $$…$$, which may run over several lines of its
// paragraph. Without a closing $$ the dollars are left as text.
func parseDisplay(block text.Reader) ast.Node {
	l, pos := block.Position()
	line, _ := block.PeekLine()
	var tex bytes.Buffer
	from := 2 // where the mathematics starts on this line
	for {
		if k := bytes.Index(line[from:], []byte("$$")); k >= 0 {
			tex.Write(line[from : from+k])
			if t := strings.TrimSpace(tex.String()); t != "" {
				block.Advance(from + k + 2)
				return &mathNode{tex: t, display: true}
			}
			break
		}
		tex.Write(line[from:])
		block.AdvanceLine()
		if line, _ = block.PeekLine(); line == nil {
			break
		}
		from = 0
	}
	block.SetPosition(l, pos)
	return nil
}

// texWords are the TeX commands shown as the character they stand for.
var texWords = map[string]string{
	"alpha": "α", "beta": "β", "gamma": "γ", "delta": "δ", "epsilon": "ε", "varepsilon": "ε",
	"zeta": "ζ", "eta": "η", "theta": "θ", "kappa": "κ", "lambda": "λ", "mu": "μ", "nu": "ν",
	"xi": "ξ", "pi": "π", "rho": "ρ", "sigma": "σ", "tau": "τ", "phi": "φ", "varphi": "φ",
	"chi": "χ", "psi": "ψ", "omega": "ω", "Gamma": "Γ", "Delta": "Δ", "Theta": "Θ",
	"Lambda": "Λ", "Pi": "Π", "Sigma": "Σ", "Phi": "Φ", "Psi": "Ψ", "Omega": "Ω",
	"cdot": "·", "times": "×", "approx": "≈", "le": "≤", "leq": "≤", "ge": "≥", "geq": "≥",
	"ne": "≠", "neq": "≠", "pm": "±", "infty": "∞", "partial": "∂", "nabla": "∇",
	"int": "∫", "oint": "∮", "iint": "∬", "sum": "∑", "sqrt": "√", "to": "→", "propto": "∝",
	"ll": "≪", "gg": "≫", "sim": "∼", "left": "", "right": "", ",": "\u2009", ";": " ", "quad": "\u2003",
	"ln": "ln", "sin": "sin", "cos": "cos", "exp": "exp", "log": "log", "tanh": "tanh",
}

var (
	texWrap    = regexp.MustCompile(`\\(?:mathrm|text|mathbf|hat|vec|operatorname)\{([^{}]*)\}`)
	texFrac    = regexp.MustCompile(`\\frac\{([^{}]*)\}\{([^{}]*)\}`)
	texCommand = regexp.MustCompile(`\\([A-Za-z]+|[,;])`)
	// a single digit or sign after _ or ^, or a run of them in braces
	texScript = regexp.MustCompile(`([_^])(?:([0-9+-])|\{([0-9+-]+)\})`)
	subDigits = strings.NewReplacer("0", "₀", "1", "₁", "2", "₂", "3", "₃", "4", "₄", "5", "₅", "6", "₆", "7", "₇", "8", "₈", "9", "₉", "+", "₊", "-", "₋")
	supDigits = strings.NewReplacer("0", "⁰", "1", "¹", "2", "²", "3", "³", "4", "⁴", "5", "⁵", "6", "⁶", "7", "⁷", "8", "⁸", "9", "⁹", "+", "⁺", "-", "⁻")
)

// mathText turns TeX into readable text; commands it does not know stay
// as written.
func mathText(tex string) string {
	t := texWrap.ReplaceAllString(tex, "$1")
	t = texFrac.ReplaceAllString(t, "($1)/($2)")
	t = texCommand.ReplaceAllStringFunc(t, func(m string) string {
		if r, ok := texWords[m[1:]]; ok {
			return r
		}
		return m
	})
	t = texScript.ReplaceAllStringFunc(t, func(m string) string {
		g := texScript.FindStringSubmatch(m)
		digits := g[2] + g[3]
		if g[1] == "_" {
			return subDigits.Replace(digits)
		}
		return supDigits.Replace(digits)
	})
	t = strings.Join(strings.Fields(t), " ")
	if strings.TrimSpace(t) == "" {
		return tex // never a blank
	}
	return t
}

type mathRenderer struct{}

func (mathRenderer) RegisterFuncs(reg renderer.NodeRendererFuncRegisterer) {
	reg.Register(kindMath, func(w util.BufWriter, source []byte, n ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering {
			return ast.WalkContinue, nil
		}
		m := n.(*mathNode)
		class := "math"
		if m.display {
			class = "math display"
		}
		w.WriteString(`<span class="` + class + `" title="` + html.EscapeString(m.tex) + `">` + html.EscapeString(mathText(m.tex)) + `</span>`)
		return ast.WalkSkipChildren, nil
	})
}

// mathExtension adds the mathematics to a goldmark converter.
type mathExtension struct{}

func (mathExtension) Extend(m goldmark.Markdown) {
	m.Parser().AddOptions(parser.WithInlineParsers(util.Prioritized(mathParser{}, 150)))
	m.Renderer().AddOptions(renderer.WithNodeRenderers(util.Prioritized(mathRenderer{}, 150)))
}

// localImages shows a Markdown image as a link with its text, unless it
// is held in the page itself (a data: address): the page loads nothing.
type localImages struct{}

func (localImages) Extend(m goldmark.Markdown) {
	m.Renderer().AddOptions(renderer.WithNodeRenderers(util.Prioritized(imageLink{}, 100)))
}

type imageLink struct{}

func (imageLink) RegisterFuncs(reg renderer.NodeRendererFuncRegisterer) {
	reg.Register(ast.KindImage, func(w util.BufWriter, source []byte, n ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering {
			return ast.WalkContinue, nil
		}
		img := n.(*ast.Image)
		alt := string(img.Text(source))
		if alt == "" {
			alt = "image"
		}
		dest := string(img.Destination)
		if strings.HasPrefix(dest, "data:image/") && !strings.HasPrefix(dest, "data:image/svg") {
			w.WriteString(`<img src="` + html.EscapeString(dest) + `" alt="` + html.EscapeString(alt) + `">`)
		} else {
			w.WriteString(`<a href="` + html.EscapeString(dest) + `">[image: ` + html.EscapeString(alt) + `]</a>`)
		}
		return ast.WalkSkipChildren, nil
	})
}
