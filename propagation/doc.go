// Package propagation computes medium-wave field strengths: the ground wave
// over smooth homogeneous and mixed ground (the method of Rec. ITU-R P.368),
// and the physical constants and unit conversions it needs.
//
// All fields are the vertical electric field at ground level, in dB(µV/m),
// for a transmitter described by its power in kW and its vertical gain
// relative to a short monopole. The package prints nothing and imports no
// user-interface code.
package propagation
