// Physical constants. Units: energies in eV, times in s, lengths in m.
// Source: CODATA 2018 recommended values, E. Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021).

/** Speed of light in vacuum [m/s] (exact, SI 2019). */
export const C_LIGHT = 299_792_458;
/** Elementary charge [C] (exact, SI 2019). */
export const E_CHARGE = 1.602_176_634e-19;
/** Proton rest energy [eV] (CODATA 2018). */
export const PROTON_MASS_EV = 938.272_088_16e6;
/** Electron rest energy [eV] (CODATA 2018). */
export const ELECTRON_MASS_EV = 0.510_998_950_00e6;
/** Atomic mass unit rest energy u·c² [eV] (CODATA 2018). */
export const AMU_EV = 931.494_102_42e6;
/** Classical electron radius [m] (CODATA 2018). */
export const ELECTRON_RADIUS = 2.817_940_3262e-15;
/** Reduced Planck constant times c [eV·m] (CODATA 2018: 197.326 980 4 MeV·fm). */
export const HBAR_C_EV_M = 197.326_980_4e-9;
/** Impedance of free space [Ω] (CODATA 2018). */
export const Z0_OHM = 376.730_313_668;

export const TWO_PI = 2 * Math.PI;
export const DEG = Math.PI / 180;
