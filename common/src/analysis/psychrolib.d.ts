// The part of psychrolib (npm "psychrolib" 1.1.1, MIT; a copy of PsychroLib's JavaScript) that the
// tests use as an independent check. The package ships no type declarations. SI: °C, Pa, J/kg.
declare module 'psychrolib' {
  const psychrolib: {
    SI: number;
    IP: number;
    SetUnitSystem(unitSystem: number): void;
    /** Dry-air enthalpy, J/kg in SI (h = 1006·t, h = 0 at 0 °C; ASHRAE Handbook—Fundamentals 2017 ch. 1 eqn 28). */
    GetDryAirEnthalpy(tDryBulb: number): number;
    /** Dry-air density, kg/m³ in SI (R = 287.042 J/(kg K)). */
    GetDryAirDensity(tDryBulb: number, pressure: number): number;
  };
  export default psychrolib;
}
