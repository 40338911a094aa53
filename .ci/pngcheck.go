//go:build ignore

// Command pngcheck fails unless a PNG screenshot shows something: it must
// decode, and at least 2% of its pixels must differ from the most common
// colour (a blank or single-colour page has none).
//
//	go run .ci/pngcheck.go shot.png
package main

import (
	"fmt"
	"image"
	"image/png"
	"os"
)

func main() {
	f, err := os.Open(os.Args[1])
	if err != nil {
		fail(err)
	}
	img, err := png.Decode(f)
	if err != nil {
		fail(err)
	}
	b := img.Bounds()
	counts := map[[4]uint32]int{}
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, a := img.At(x, y).RGBA()
			counts[[4]uint32{r, g, bl, a}]++
		}
	}
	top := 0
	for _, n := range counts {
		top = max(top, n)
	}
	total := b.Dx() * b.Dy()
	other := float64(total-top) / float64(total)
	fmt.Printf("pngcheck: %dx%d, %d colours, %.1f%% of pixels off the background\n", b.Dx(), b.Dy(), len(counts), 100*other)
	if other < 0.02 {
		fail(fmt.Errorf("the screenshot is blank"))
	}
	_ = image.Point{}
}

func fail(err error) {
	fmt.Fprintln(os.Stderr, "pngcheck:", err)
	os.Exit(1)
}
