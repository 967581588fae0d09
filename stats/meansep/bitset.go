package meansep

import "math/bits"

// bitset is a fixed-size set of small non-negative integers.
type bitset []uint64

func newBitset(n int) bitset { return make(bitset, (n+63)/64) }

func (b bitset) has(i int) bool { return b[i>>6]&(1<<(uint(i)&63)) != 0 }
func (b bitset) set(i int)      { b[i>>6] |= 1 << (uint(i) & 63) }
func (b bitset) clear(i int)    { b[i>>6] &^= 1 << (uint(i) & 63) }

// subsetOf reports whether b ⊆ c.
func (b bitset) subsetOf(c bitset) bool {
	for i, w := range b {
		if w&^c[i] != 0 {
			return false
		}
	}
	return true
}

// meets reports whether b ∩ c is non-empty.
func (b bitset) meets(c bitset) bool {
	for i, w := range b {
		if w&c[i] != 0 {
			return true
		}
	}
	return false
}

// meetsExcept reports whether b ∩ c holds a member other than x.
func (b bitset) meetsExcept(c bitset, x int) bool {
	xw, xb := x>>6, uint64(1)<<(uint(x)&63)
	for i, w := range b {
		v := w & c[i]
		if i == xw {
			v &^= xb
		}
		if v != 0 {
			return true
		}
	}
	return false
}

func (b bitset) equal(c bitset) bool {
	for i, w := range b {
		if w != c[i] {
			return false
		}
	}
	return true
}

func (b bitset) count() int {
	n := 0
	for _, w := range b {
		n += bits.OnesCount64(w)
	}
	return n
}

// each calls f for every member of b in increasing order.
func (b bitset) each(f func(i int)) {
	for wi, w := range b {
		for w != 0 {
			t := bits.TrailingZeros64(w)
			f(wi<<6 | t)
			w &= w - 1
		}
	}
}

// first returns the smallest member of b, or -1 when b is empty.
func (b bitset) first() int {
	for wi, w := range b {
		if w != 0 {
			return wi<<6 | bits.TrailingZeros64(w)
		}
	}
	return -1
}
