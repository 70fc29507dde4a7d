package drawing

import (
	"reflect"
	"testing"
)

func box() Size { return Size{W: 40, H: 20} }

func TestLayeredPutsEachNodeBelowTheLongestPathToIt(t *testing.T) {
	// a -> b -> c and a -> c: c goes below b (longest path), and a -> c
	// bends once in b's layer.
	lay := Layered([]Size{box(), box(), box()}, []Edge{{0, 1}, {1, 2}, {0, 2}})
	a, b, c := lay.Centres[0], lay.Centres[1], lay.Centres[2]
	if !(a.Y < b.Y && b.Y < c.Y) {
		t.Errorf("layers: a %v, b %v, c %v", a, b, c)
	}
	if n := len(lay.Routes[2]); n != 3 {
		t.Errorf("a -> c spans two layers: %d points, want 3 (one bend)", n)
	}
	// Routes run from the bottom of the upper box to the top of the lower.
	if r := lay.Routes[0]; r[0].Y != a.Y+10 || r[len(r)-1].Y != b.Y-10 {
		t.Errorf("route a -> b: %v", r)
	}
}

func TestLayeredOrdersLayersToRemoveCrossings(t *testing.T) {
	// 0 -> 3 and 1 -> 2 cross in the given order; barycentre ordering
	// puts 3 left of 2.
	lay := Layered([]Size{box(), box(), box(), box()}, []Edge{{0, 3}, {1, 2}})
	c := lay.Centres
	if (c[0].X-c[1].X)*(c[3].X-c[2].X) < 0 {
		t.Errorf("the edges still cross: %v", c)
	}
}

func TestLayeredSurvivesCyclesAndSelfLoops(t *testing.T) {
	edges := []Edge{{0, 1}, {1, 2}, {2, 0}, {1, 1}}
	lay := Layered([]Size{box(), box(), box()}, edges)
	if lay.Routes[3] != nil {
		t.Error("a self loop got a route")
	}
	// The edge that closes the cycle is drawn from 2 back up to 0.
	r := lay.Routes[2]
	if r == nil || r[0].Y <= r[len(r)-1].Y {
		t.Errorf("the closing edge 2 -> 0 should run upwards: %v", r)
	}
	again := Layered([]Size{box(), box(), box()}, edges)
	if !reflect.DeepEqual(lay, again) {
		t.Error("two layouts of one graph differ")
	}
}

func TestLayeredEmpty(t *testing.T) {
	lay := Layered(nil, nil)
	if len(lay.Centres) != 0 || lay.Width <= 0 || lay.Height <= 0 {
		t.Errorf("empty layout: %+v", lay)
	}
}
