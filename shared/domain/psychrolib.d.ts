// Types for the parts of psychrolib 1.1.1 (a devDependency) that the psychrometrics tests compare
// against. psychrolib ships no types. Tests only: product code must not import psychrolib.
declare module "psychrolib" {
  interface Psychrolib {
    readonly SI: number;
    readonly IP: number;
    SetUnitSystem(unitSystem: number): void;
    /** Pa [SI]; ASHRAE Handbook—Fundamentals (2017) ch. 1, over ice at or below the triple point. */
    GetSatVapPres(tDryBulbC: number): number;
    /** °C [SI]; relHum as a fraction 0–1. */
    GetTDewPointFromRelHum(tDryBulbC: number, relHum: number): number;
    /** Pa [SI]; relHum as a fraction 0–1. */
    GetVapPresFromRelHum(tDryBulbC: number, relHum: number): number;
    /** Pa [SI]. */
    GetVPD(tDryBulbC: number, humRatio: number, pressurePa: number): number;
  }
  const psychrolib: Psychrolib;
  export default psychrolib;
}
