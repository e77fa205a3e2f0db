// Package receiver models the listener's rig: antenna, loading coil, tuned
// circuit, diode detector, headphones, optional amplifier and wave trap,
// and answers what that rig hears from the fields computed by package
// propagation. It imports no user-interface code.
package receiver
