package report

// gridOutput converts local-plane points to a projected output system.
type gridOutput struct {
	forward func(x, y float64) (float64, float64)
}
