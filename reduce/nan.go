package reduce

import "math"

var nan = math.NaN()
