package builtins

import (
	"fmt"
	"math"
	"strings"

	"loopwise/runtime"
)

// Safety thresholds. They inform; they do not certify. Each caution defers
// to local codes and licensed practice.
const (
	// Extra-low voltage: 50 V AC rms and 120 V ripple-free DC (IEC 61140,
	// Protection against electric shock, and IEC 60364-4-41; from memory).
	elvAC = 50.0
	elvDC = 120.0
	// Induction-heating power densities above which a workpiece heats fast
	// enough to burn or ignite within seconds: 1 W/cm³ in volume, 1 W/cm²
	// at a surface (rule of thumb, common practice).
	heatVolume  = 1e6 // W/m³
	heatSurface = 1e4 // W/m²
)

const deferText = "Treat it as hazardous: follow local electrical codes, exposure rules and licensed practice."

var (
	dimSurfacePower  = mustDim("W/m^2")
	dimDimensionless runtime.Dim
)

// Caution returns a caution for a result that can hurt someone, or "".
// The session shows it beside the result.
func Caution(v runtime.Value) string {
	switch x := v.(type) {
	case *Assessment:
		if x.Exceeded {
			return "caution: " + x.Text + " " + deferText
		}
	case *Table:
		return x.Caution
	case *CoreReport:
		return x.caution()
	case *ACResult:
		if name, peak := x.sol.LargestVoltage(); peak/math.Sqrt2 > elvAC {
			return fmt.Sprintf("caution: %s peak (%s rms) across %s is above the AC extra-low-voltage limit (50 V rms; IEC 61140, from memory); a resonant circuit raises its source's voltage by its Q. %s", runtime.Format(runtime.Quantity{V: peak, D: dimVolt}, 4), runtime.Format(runtime.Quantity{V: peak / math.Sqrt2, D: dimVolt}, 4), name, deferText)
		}
	case runtime.Complex:
		if x.D == dimVolt {
			if a := x.Abs().V; a/math.Sqrt2 > elvAC {
				return fmt.Sprintf("caution: a peak phasor of %s is %s rms, above the AC extra-low-voltage limit (50 V rms; IEC 61140, from memory). %s", runtime.Format(x.Abs(), 4), runtime.Format(runtime.Quantity{V: a / math.Sqrt2, D: dimVolt}, 4), deferText)
			}
		}
	case runtime.Quantity:
		a := math.Abs(x.V)
		switch x.D {
		case dimVolt:
			switch {
			case a > elvDC:
				return fmt.Sprintf("caution: %s is above extra-low voltage (50 V AC rms, 120 V ripple-free DC; IEC 61140 and IEC 60364-4-41, from memory). %s", runtime.Format(x, 4), deferText)
			case a > elvAC:
				return fmt.Sprintf("caution: %s is above the AC extra-low-voltage limit (50 V rms; IEC 61140, from memory) if it is an AC value. %s", runtime.Format(x, 4), deferText)
			}
		case dimPowerDensity:
			if a > heatVolume {
				return fmt.Sprintf("caution: %s heats metal fast (above 1 W/cm³, common practice): burns, fire and hot fragments are possible. %s", runtime.Format(x, 4), deferText)
			}
		case dimSurfacePower:
			if a > heatSurface {
				return fmt.Sprintf("caution: %s at a surface heats it fast (above 1 W/cm², common practice). %s", runtime.Format(x, 4), deferText)
			}
		}
	}
	return ""
}

// Assessment is the verdict of a safety check.
type Assessment struct {
	Ratio    float64 // value / limit
	Text     string
	Exceeded bool
}

func (a *Assessment) Kind() string           { return "a safety assessment" }
func (a *Assessment) Show(digits int) string { return a.Text }
func (a *Assessment) Summary(digits int) string {
	return a.Text
}

// icnirpLimit returns the ICNIRP 2010 reference level for magnetic flux
// density (T, rms) at frequency f (Hz), for the general public or workers:
// ICNIRP, "Guidelines for limiting exposure to time-varying electric and
// magnetic fields (1 Hz – 100 kHz)", Health Physics 99(6):818–836, 2010,
// Tables 3 (occupational) and 4 (general public), extended to 10 MHz as
// those tables are (from memory).
func icnirpLimit(f float64, occupational bool) (float64, error) {
	if !(f >= 1 && f <= 10e6) {
		return 0, fmt.Errorf("the ICNIRP 2010 reference levels cover 1 Hz to 10 MHz; %s is outside", runtime.Format(runtime.Quantity{V: f, D: dimHertz, Cyc: true}, 4))
	}
	if occupational {
		switch {
		case f < 8:
			return 0.2 / (f * f), nil
		case f < 25:
			return 2.5e-2 / f, nil
		case f < 300:
			return 1e-3, nil
		case f < 3000:
			return 0.3 / f, nil
		default:
			return 1e-4, nil
		}
	}
	switch {
	case f < 8:
		return 4e-2 / (f * f), nil
	case f < 25:
		return 5e-3 / f, nil
	case f < 400:
		return 2e-4, nil
	case f < 3000:
		return 8e-2 / f, nil
	default:
		return 2.7e-5, nil
	}
}

func groupArg(fn string, args []runtime.Value, i int) (bool, string, error) {
	if len(args) <= i {
		return false, "general public", nil
	}
	s, ok := args[i].(string)
	if !ok {
		return false, "", errorf(`%s: the group must be "public" or "occupational", not %s`, fn, runtime.TypeName(args[i]))
	}
	switch strings.ToLower(s) {
	case "public", "general public":
		return false, "general public", nil
	case "occupational", "workers", "worker":
		return true, "occupational", nil
	}
	return false, "", errorf(`%s: the group must be "public" or "occupational", not %q`, fn, s)
}

func cautionFuncs() []*runtime.Func {
	return []*runtime.Func{
		fnc("exposure_limit", []string{"frequency", "group"}, 1, 2, &runtime.Help{
			Signature: `exposure_limit(frequency: Hz[, group: "public" or "occupational"]) -> T (rms)`,
			Summary:   "The ICNIRP 2010 reference level for magnetic flux density (rms) at a frequency, 1 Hz to 10 MHz.",
			Example:   "exposure_limit(50 Hz)",
			Reference: "ICNIRP 2010 guidelines, Health Physics 99(6):818–836, Tables 3 and 4 (from memory); local rules may differ and prevail",
		}, func(args []runtime.Value) (runtime.Value, error) {
			f, err := ofDim("exposure_limit", args, 0, dimHertz)
			if err != nil {
				return nil, err
			}
			occ, _, err := groupArg("exposure_limit", args, 1)
			if err != nil {
				return nil, err
			}
			l, err := icnirpLimit(f, occ)
			if err != nil {
				return nil, errorf("exposure_limit: %v", err)
			}
			return runtime.Quantity{V: l, D: dimTesla}, nil
		}),
		fnc("exposure_check", []string{"B_rms", "frequency", "group"}, 2, 3, &runtime.Help{
			Signature: `exposure_check(B_rms: T, frequency: Hz[, group: "public" or "occupational"]) -> assessment`,
			Summary:   "Compares a magnetic flux density (rms) with the ICNIRP 2010 reference level at its frequency and says whether it is exceeded; a caution is shown when it is.",
			Example:   "exposure_check(150 uT, 50 Hz)",
			Reference: "ICNIRP 2010 guidelines, Tables 3 and 4 (from memory); reference levels are screening values, not the basic restrictions themselves",
		}, func(args []runtime.Value) (runtime.Value, error) {
			b, err := ofDim("exposure_check", args, 0, dimTesla)
			if err != nil {
				return nil, err
			}
			f, err := ofDim("exposure_check", args, 1, dimHertz)
			if err != nil {
				return nil, err
			}
			occ, group, err := groupArg("exposure_check", args, 2)
			if err != nil {
				return nil, err
			}
			l, err := icnirpLimit(f, occ)
			if err != nil {
				return nil, errorf("exposure_check: %v", err)
			}
			r := math.Abs(b) / l
			verdict := "within"
			if r > 1 {
				verdict = "above"
			}
			text := fmt.Sprintf("%s is %s the ICNIRP 2010 %s reference level at %s (%s): %s of it",
				runtime.Format(runtime.Quantity{V: math.Abs(b), D: dimTesla}, 4), verdict, group,
				runtime.Format(runtime.Quantity{V: f, D: dimHertz, Cyc: true}, 4), runtime.Format(runtime.Quantity{V: l, D: dimTesla}, 4),
				percent(r))
			return &Assessment{Ratio: r, Text: text + ".", Exceeded: r > 1}, nil
		}),
		fnc("voltage_check", []string{"voltage", "kind"}, 2, 2, &runtime.Help{
			Signature: `voltage_check(voltage: V, kind: "ac" (rms) or "dc" (ripple-free)) -> assessment`,
			Summary:   "Compares a voltage with the extra-low-voltage limits (50 V AC rms, 120 V ripple-free DC); a caution is shown above them.",
			Example:   `voltage_check(36 V, "ac")`,
			Reference: "IEC 61140 and IEC 60364-4-41 (from memory); local codes prevail",
		}, func(args []runtime.Value) (runtime.Value, error) {
			v, err := ofDim("voltage_check", args, 0, dimVolt)
			if err != nil {
				return nil, err
			}
			kind, ok := args[1].(string)
			limit := 0.0
			switch strings.ToLower(kind) {
			case "ac":
				limit = elvAC
			case "dc":
				limit = elvDC
			}
			if !ok || limit == 0 {
				return nil, errorf(`voltage_check: the kind must be "ac" or "dc"`)
			}
			r := math.Abs(v) / limit
			verdict := "within"
			if r > 1 {
				verdict = "above"
			}
			text := fmt.Sprintf("%s %s is %s extra-low voltage (%s limit %s): %s of it",
				runtime.Format(runtime.Quantity{V: math.Abs(v), D: dimVolt}, 4), strings.ToUpper(kind), verdict, strings.ToUpper(kind),
				runtime.Format(runtime.Quantity{V: limit, D: dimVolt}, 4), percent(r))
			return &Assessment{Ratio: r, Text: text + ".", Exceeded: r > 1}, nil
		}),
	}
}

func percent(r float64) string {
	return runtime.FormatNumber(100*r, 3) + " %"
}
