// Ideal-gas enthalpy of dry air, h(T) in kJ/kg with h = 0 at 0 K, 250–400 K.
// Source: Çengel, Y. A. and Boles, M. A., Thermodynamics: An Engineering Approach (McGraw-Hill),
// Appendix 1, Table A-17 "Ideal-gas properties of air" (the book credits Keenan & Kaye, Gas Tables,
// 1948). Transcribed from two independent public copies of the table that agree on every row used
// here; cross-checked against the NASA Glenn coefficients for air (McBride, Zehe & Gordon,
// NASA/TP-2002-211556): enthalpy differences agree within 0.06 kJ/kg over 250–400 K.
// Only differences h(T2) − h(T1) mean anything physically: take every stream of a balance from
// this one table (or one constant cp), never mix it with a table on another reference state.

export const AIR_ENTHALPY_TABLE_SOURCE =
  'Çengel & Boles, Thermodynamics: An Engineering Approach, Table A-17 (ideal-gas properties of air), h = 0 at 0 K';

/** Temperatures, K (strictly increasing). */
export const AIR_ENTHALPY_T_K: readonly number[] = [250, 260, 270, 280, 285, 290, 295, 298, 300, 305, 310, 315, 320, 325, 330, 340, 350, 360, 370, 380, 390, 400];

/** h at those temperatures, kJ/kg. */
export const AIR_ENTHALPY_H_KJ_PER_KG: readonly number[] = [250.05, 260.09, 270.11, 280.13, 285.14, 290.16, 295.17, 298.18, 300.19, 305.22, 310.24, 315.27, 320.29, 325.31, 330.34, 340.42, 350.49, 360.58, 370.67, 380.77, 390.88, 400.98];
