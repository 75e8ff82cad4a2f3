package register

import "strconv"

// number is what one pass over a cell's text finds about it as a number.
type number struct {
	syntax bool    // [+-]digits[.digits][e[+-]digits], at least one digit before the exponent
	plain  bool    // with syntax: written as a spreadsheet or a program writes a number (see isPlainNumber)
	exact  bool    // with syntax: x holds the value, as strconv.ParseFloat would return it
	x      float64 //
}

// pow10 are the powers of ten a float64 holds exactly.
var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
	1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// scanNumber reads s as a decimal number in one pass. When the significant digits fit a
// float64 mantissa exactly (at most 19 digits, below 2^53) and the decimal exponent is
// within ±22, the value is one correctly rounded multiplication or division of two exact
// floats: the same number strconv.ParseFloat returns (it takes the same fast path). Other
// numbers leave exact false for the caller to parse with strconv.
func scanNumber(s string) number {
	var r number
	i, n := 0, len(s)
	neg, plus := false, false
	if i < n && (s[i] == '+' || s[i] == '-') {
		neg, plus = s[i] == '-', s[i] == '+'
		i++
	}
	var mant uint64
	nd, exp, exact := 0, 0, true
	digit := func(d byte) {
		switch {
		case mant == 0 && d == 0: // a leading zero
		case nd < 19:
			mant = mant*10 + uint64(d)
			nd++
		default:
			exact = false
		}
	}
	intStart := i
	for i < n && s[i] >= '0' && s[i] <= '9' {
		digit(s[i] - '0')
		i++
	}
	intDigits := i - intStart
	point, fracDigits := false, 0
	if i < n && s[i] == '.' {
		point = true
		i++
		for i < n && s[i] >= '0' && s[i] <= '9' {
			digit(s[i] - '0')
			exp--
			i++
			fracDigits++
		}
	}
	if intDigits+fracDigits == 0 {
		return r
	}
	if i < n && (s[i] == 'e' || s[i] == 'E') {
		i++
		eneg := false
		if i < n && (s[i] == '+' || s[i] == '-') {
			eneg = s[i] == '-'
			i++
		}
		e, ed := 0, 0
		for i < n && s[i] >= '0' && s[i] <= '9' {
			if e < 100000 {
				e = e*10 + int(s[i]-'0')
			}
			i, ed = i+1, ed+1
		}
		if ed == 0 {
			return r
		}
		if eneg {
			e = -e
		}
		exp += e
	}
	if i != n {
		return r
	}
	r.syntax = true
	r.plain = !plus && intDigits > 0 && !(point && fracDigits == 0) && !(intDigits > 1 && s[intStart] == '0')
	if exact && mant < 1<<53 && exp >= -22 && exp <= 22 {
		f := float64(mant)
		if neg {
			f = -f
		}
		if exp > 0 {
			f *= pow10[exp]
		} else if exp < 0 {
			f /= pow10[-exp]
		}
		r.x, r.exact = f, true
	}
	return r
}

// float is the number's value and strconv.ParseFloat's error, for a string with syntax.
func (r number) float(s string) (float64, error) {
	if r.exact {
		return r.x, nil
	}
	return strconv.ParseFloat(s, 64)
}
