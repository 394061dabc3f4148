package plan

import "math"

// sym is a small dense symmetric matrix stored in full, row-major.
type sym struct {
	n int
	a []float64
}

func newSym(n int) sym { return sym{n, make([]float64, n*n)} }

func (m sym) at(i, j int) float64     { return m.a[i*m.n+j] }
func (m sym) add(i, j int, v float64) { m.a[i*m.n+j] += v }

// cholesky factors m = L L^T in place of a copy and returns L (lower
// triangle), or false when m is not positive definite.
func (m sym) cholesky() ([]float64, bool) {
	n := m.n
	l := make([]float64, n*n)
	for j := 0; j < n; j++ {
		s := m.a[j*n+j]
		for k := 0; k < j; k++ {
			s -= l[j*n+k] * l[j*n+k]
		}
		if !(s > 0) || math.IsInf(s, 0) {
			return nil, false
		}
		d := math.Sqrt(s)
		l[j*n+j] = d
		for i := j + 1; i < n; i++ {
			s := m.a[i*n+j]
			for k := 0; k < j; k++ {
				s -= l[i*n+k] * l[j*n+k]
			}
			l[i*n+j] = s / d
		}
	}
	return l, true
}

// cholSolve solves L L^T x = b.
func cholSolve(l []float64, n int, b []float64) []float64 {
	x := make([]float64, n)
	copy(x, b)
	for i := 0; i < n; i++ {
		s := x[i]
		for k := 0; k < i; k++ {
			s -= l[i*n+k] * x[k]
		}
		x[i] = s / l[i*n+i]
	}
	for i := n - 1; i >= 0; i-- {
		s := x[i]
		for k := i + 1; k < n; k++ {
			s -= l[k*n+i] * x[k]
		}
		x[i] = s / l[i*n+i]
	}
	return x
}

// solve solves m x = b by Cholesky; false when m is not positive definite.
func (m sym) solve(b []float64) ([]float64, bool) {
	l, ok := m.cholesky()
	if !ok {
		return nil, false
	}
	return cholSolve(l, m.n, b), true
}

// inverse returns m^-1, or false when m is not positive definite.
func (m sym) inverse() (sym, bool) {
	l, ok := m.cholesky()
	if !ok {
		return sym{}, false
	}
	inv := newSym(m.n)
	e := make([]float64, m.n)
	for j := 0; j < m.n; j++ {
		for i := range e {
			e[i] = 0
		}
		e[j] = 1
		col := cholSolve(l, m.n, e)
		for i := 0; i < m.n; i++ {
			inv.a[i*m.n+j] = col[i]
		}
	}
	return inv, true
}

// quad returns g^T m g.
func (m sym) quad(g []float64) float64 {
	s := 0.0
	for i := 0; i < m.n; i++ {
		for j := 0; j < m.n; j++ {
			s += g[i] * m.a[i*m.n+j] * g[j]
		}
	}
	return s
}

// finite reports whether x is neither NaN nor infinite.
func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
