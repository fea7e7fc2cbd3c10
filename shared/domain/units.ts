/**
 * Conversion factors, from NIST Special Publication 811 (2008), Appendix B.8.
 * Exact where the publication says so; otherwise the tabled value.
 */
export const FACTORS = {
  inToMm: 25.4, // exact
  microinToMicrom: 0.0254, // exact
  lbfFtToNm: 1.3558179483, // 1.355 818 E+00 tabled; 1.355 817 948 3 from lbf = 4.448 221 615 260 5 N × 0.3048 m
  psiToKPa: 6.894757293, // 6.894 757 E+00 tabled
  inHgToKPa: 3.386389, // conventional inch of mercury, 3.386 389 E+00
  in3ToCm3: 16.387064, // exact
  hpToW: 745.69987158, // 1 hp = 550 ft·lbf/s = 7.456 999 E+02 W
} as const;

export const inToMm = (v: number) => v * FACTORS.inToMm;
export const mmToIn = (v: number) => v / FACTORS.inToMm;
export const microinToMicrom = (v: number) => v * FACTORS.microinToMicrom;
export const lbfFtToNm = (v: number) => v * FACTORS.lbfFtToNm;
export const nmToLbfFt = (v: number) => v / FACTORS.lbfFtToNm;
export const psiToKPa = (v: number) => v * FACTORS.psiToKPa;
export const kPaToPsi = (v: number) => v / FACTORS.psiToKPa;
export const inHgToKPa = (v: number) => v * FACTORS.inHgToKPa;
export const in3ToCm3 = (v: number) => v * FACTORS.in3ToCm3;
export const hpToW = (v: number) => v * FACTORS.hpToW;
