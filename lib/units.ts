// Exact unit definitions. The foot and the pound are fixed by the 1959 international yard and pound
// agreement (NIST Handbook 44, Appendix C); the acre follows from the foot (43 560 ft²); the hectare is SI.
// Every conversion below is built from these constants only, so no rounded factor (such as 4046.86 m²
// per acre or 2.2046 lb per kg) can creep in.

export const FOOT_M = 0.3048;
/** 1/12 ft; written out because 0.3048 / 12 in floating point is 0.025400000000000002. */
export const INCH_M = 0.0254;
export const SQFT_PER_ACRE = 43560;
/** 43 560 ft² × 0.3048² m²/ft² = 4 046.856 422 4 m² exactly. */
export const ACRE_M2 = 4046.8564224;
export const POUND_KG = 0.45359237;
export const HECTARE_M2 = 10000;

export function acresToHectares(acres: number): number {
  return (acres * ACRE_M2) / HECTARE_M2;
}

export function hectaresToAcres(hectares: number): number {
  return (hectares * HECTARE_M2) / ACRE_M2;
}

/** 1 lb/ac ≈ 1.120 85 kg/ha. */
export function lbPerAcreToKgPerHa(lbPerAcre: number): number {
  return (lbPerAcre * POUND_KG * HECTARE_M2) / ACRE_M2;
}

export function kgPerHaToLbPerAcre(kgPerHa: number): number {
  return (kgPerHa * ACRE_M2) / (POUND_KG * HECTARE_M2);
}

/** 1 g/m² = 10 kg/ha ≈ 8.921 79 lb/ac. */
export function gramsPerM2ToLbPerAcre(gramsPerM2: number): number {
  return (gramsPerM2 * ACRE_M2) / (1000 * POUND_KG);
}

export function lbToKg(lb: number): number {
  return lb * POUND_KG;
}

export function kgToLb(kg: number): number {
  return kg / POUND_KG;
}

/** 0.3048² = 0.092 903 04 m² per ft², exact in decimal (and the nearest double to it). */
const FT2_M2 = FOOT_M * FOOT_M;

export function ft2ToM2(ft2: number): number {
  return ft2 * FT2_M2;
}

export function m2ToFt2(m2: number): number {
  return m2 / FT2_M2;
}
