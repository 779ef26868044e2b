package builtins

import (
	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/runtime"
)

const refR3 = "gonum.org/v1/gonum/spatial/r3 (Dot, Cross, Norm, Unit)"

func toR3(v runtime.Vector) r3.Vec { return r3.Vec{X: v.V[0], Y: v.V[1], Z: v.V[2]} }

func fromR3(v r3.Vec, d runtime.Dim) runtime.Vector {
	return runtime.Vector{V: [3]float64{v.X, v.Y, v.Z}, D: d}
}

func vec2(name string, f func(a, b runtime.Vector) (runtime.Value, error), help *runtime.Help) *runtime.Func {
	return &runtime.Func{
		Name: name, Params: []string{"a", "b"}, MinArgs: 2, MaxArgs: 2,
		Call: func(args []runtime.Value) (runtime.Value, error) {
			a, err := vector(name, args, 0)
			if err != nil {
				return nil, err
			}
			b, err := vector(name, args, 1)
			if err != nil {
				return nil, err
			}
			if _, ok := a.D.Combine(1, b.D, 1); !ok {
				return nil, errorf("%s: the unit of the product has exponents beyond ±127", name)
			}
			return f(a, b)
		},
		Help: help,
	}
}

func vectorFuncs() []*runtime.Func {
	return withTangents([]*runtime.Func{
		vec2("dot", func(a, b runtime.Vector) (runtime.Value, error) {
			return runtime.Quantity{V: r3.Dot(toR3(a), toR3(b)), D: a.D.Mul(b.D)}, nil
		}, &runtime.Help{
			Signature: "dot(a: vector [u], b: vector [v]) -> u*v",
			Summary:   "Scalar (dot) product of two vectors; units multiply.",
			Example:   "dot([1, 0, 0] A, [0.2, 0.1, 0] m)",
			Reference: refR3,
		}),
		vec2("cross", func(a, b runtime.Vector) (runtime.Value, error) {
			return fromR3(r3.Cross(toR3(a), toR3(b)), a.D.Mul(b.D)), nil
		}, &runtime.Help{
			Signature: "cross(a: vector [u], b: vector [v]) -> vector [u*v]",
			Summary:   "Vector (cross) product, right-handed; units multiply.",
			Example:   "cross([0, 0, 2] m/s, [0.5, 0, 0] T)",
			Reference: refR3,
		}),
		{
			Name: "norm", Params: []string{"v"}, MinArgs: 1, MaxArgs: 1,
			Call: func(args []runtime.Value) (runtime.Value, error) {
				v, err := vector("norm", args, 0)
				if err != nil {
					return nil, err
				}
				return runtime.Quantity{V: r3.Norm(toR3(v)), D: v.D}, nil
			},
			Help: &runtime.Help{
				Signature: "norm(v: vector [u]) -> u",
				Summary:   "Euclidean length of a vector.",
				Example:   "norm([3, 4, 0] mm)",
				Reference: refR3,
			},
		},
		{
			Name: "direction", Params: []string{"v"}, MinArgs: 1, MaxArgs: 1,
			Call: func(args []runtime.Value) (runtime.Value, error) {
				v, err := vector("direction", args, 0)
				if err != nil {
					return nil, err
				}
				if r3.Norm(toR3(v)) == 0 {
					return nil, errorf("direction: the zero vector has no direction")
				}
				return fromR3(r3.Unit(toR3(v)), runtime.Dimensionless), nil
			},
			Help: &runtime.Help{
				Signature: "direction(v: vector [u]) -> dimensionless vector",
				Summary:   "Unit vector along v (v divided by its length).",
				Example:   "direction([3, 4, 0] mm)",
				Reference: refR3,
			},
		},
	})
}
