/** Physical constants, SI. */
/** Stefan–Boltzmann constant, W/(m²·K⁴) — CODATA 2018 (exact from the SI defining constants). */
export const STEFAN_BOLTZMANN = 5.670374419e-8;
/** Standard gravity, m/s² (CGPM 1901, exact). */
export const GRAVITY = 9.80665;
/** 0 °C in kelvin. */
export const KELVIN = 273.15;
/** Standard atmosphere, Pa. */
export const STANDARD_PRESSURE = 101325;
/** Specific gas constant of dry air, J/(kg·K) — U.S. Standard Atmosphere 1976 (R* / M0). */
export const R_AIR = 287.05287;
