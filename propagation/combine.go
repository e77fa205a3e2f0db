package propagation

import (
	"math"
	"sync"
	"time"

	"gonum.org/v1/gonum/stat/distuv"
)

// decileZ is the standard normal deviate exceeded with probability 10 %,
// Φ⁻¹(0.9) = 1.2816 (the factor P.372 and P.1147 use between a decile
// and the standard deviation; methods.md §3.3).
const decileZ = 1.2815515655446004

// SkyWaveAt returns the sky wave of sp at instant t: the reference-time
// median of NightSkyWave less the hourly loss factor L_t,
//
//	E(t) = E_ref − L_t(t)     dB(µV/m)  (annual median at that time)
//
// together with the terms and the sun times behind it.
//
// Reference: Rec. ITU-R P.1147-4 eq. (1) and §2.7.
func SkyWaveAt(sp SkyPath, t time.Time) (SkyWave, HourlyLoss, float64, error) {
	s, err := NightSkyWave(sp)
	if err != nil {
		return SkyWave{}, HourlyLoss{}, 0, err
	}
	hl, err := HourlyLossDB(t, sp.Tx, sp.Rx)
	if err != nil {
		return SkyWave{}, HourlyLoss{}, 0, err
	}
	return s, hl, s.MedianDBuVm - hl.LossDB, nil
}

// PowerSumDBuVm returns the power sum of two fields in dB(µV/m),
// 10·log10(10^{a/10} + 10^{b/10}): the median of a steady ground wave plus
// an incoherent sky wave (methods.md §10 step 4). Either may be −Inf (no
// such wave).
//
// The increment 10·log10(1 + 10^{−Δ/10}) is read from a table in steps of
// 0.01 dB of Δ = hi − lo with linear interpolation (error below 1e-5 dB;
// maps call this millions of times).
func PowerSumDBuVm(a, b float64) float64 {
	hi, lo := math.Max(a, b), math.Min(a, b)
	delta := hi - lo
	if !(delta < powerSumMaxDB) { // adds less than 1e-8 dB (and covers lo = −Inf)
		return hi
	}
	x := delta / powerSumStepDB
	i := int(x)
	t := powerSumTable()
	return hi + t[i] + (x-float64(i))*(t[i+1]-t[i])
}

const (
	powerSumStepDB = 0.01
	powerSumMaxDB  = 80.0
)

// powerSumTable holds 10·log10(1 + 10^{−Δ/10}) for Δ = 0, 0.01, … 80.01 dB.
var powerSumTable = sync.OnceValue(func() []float64 {
	n := int(powerSumMaxDB/powerSumStepDB) + 2
	t := make([]float64, n)
	for i := range t {
		t[i] = 10 * math.Log10(1+math.Pow(10, -float64(i)*powerSumStepDB/10))
	}
	return t
})

// InFadingZone reports whether ground and sky waves are within FadingZoneDB
// of each other, where they interfere and the signal fades and distorts
// (the night "fading zone" of broadcast practice; common practice).
func InFadingZone(groundDBuVm, skyDBuVm float64) bool {
	return math.Abs(groundDBuVm-skyDBuVm) < FadingZoneDB
}

// ExceedanceProbability returns the probability (over nights) that the
// total field exceeds levelDBuVm, for a steady ground wave groundDBuVm
// (−Inf if none) and a night sky wave that is log-normal about its median
// skyMedianDBuVm with the upper decile decileSpreadDB above the median
// (σ = Δ/1.2816; P.1147 §3, methods.md §2.4):
//
//	P = 1                                   if E_g ≥ L
//	P = Q( (10·log10(10^{L/10} − 10^{E_g/10}) − E_s) / σ )   otherwise
//
// Q is the standard normal survival function (gonum distuv). By day
// (sky wave negligible) P is 0 or 1 by the ground wave alone.
func ExceedanceProbability(levelDBuVm, groundDBuVm, skyMedianDBuVm, decileSpreadDB float64) float64 {
	if groundDBuVm >= levelDBuVm {
		return 1
	}
	need := levelDBuVm
	if !math.IsInf(groundDBuVm, -1) {
		need = levelDBuVm + 10*math.Log10(1-math.Pow(10, (groundDBuVm-levelDBuVm)/10))
	}
	if math.IsInf(skyMedianDBuVm, -1) {
		return 0
	}
	sigma := decileSpreadDB / decileZ
	if sigma <= 0 {
		if skyMedianDBuVm > need {
			return 1
		}
		return 0
	}
	return distuv.Normal{Mu: skyMedianDBuVm, Sigma: sigma}.Survival(need)
}
