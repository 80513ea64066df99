package fieldsolve

import (
	"errors"
	"fmt"
	"math"
)

// ErrGridTooLarge is wrapped by the refusal of a cross-section whose grid
// would be too large to build, before any grid is allocated.
var ErrGridTooLarge = errors.New("fieldsolve: the grid would be too large")

// maxFeatureRatio is the largest ratio of the solution box to the smallest
// feature the graded grid can resolve: beyond it the node coordinates near
// the box lose the digits that tell neighbouring lines apart (float64 has
// about 16), and the grid grows without bound.
const maxFeatureRatio = 1e8

// checkGridSize refuses, with the figures, a cross-section whose box is too
// large for its smallest feature, or whose first grid alone would exceed
// maxCells nodes. Only the two 1-D axes are built to count the nodes.
func checkGridSize(l *layout, maxCells int) error {
	span := math.Max(l.xMax, l.yMax)
	if ratio := span / l.lmin; !(ratio <= maxFeatureRatio) {
		return fmt.Errorf("%w: the solution box spans %.3g m and the smallest feature is %.3g m, a ratio of %.3g (at most %.0e); make the strip, gap and dielectric closer in size",
			ErrGridTooLarge, span, l.lmin, ratio, maxFeatureRatio)
	}
	kx, ky, sx, sy := l.keys()
	d := coreFraction * l.lmin
	nx, ny := len(gradedAxis(kx, sx, d, startDensity)), len(gradedAxis(ky, sy, d, startDensity))
	if cells := nx * ny; cells > maxCells {
		return fmt.Errorf("%w: the first grid alone has %d × %d = %d nodes, above the limit of %d", ErrGridTooLarge, nx, ny, cells, maxCells)
	}
	return nil
}
