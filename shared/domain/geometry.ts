/** Swept volume of all cylinders: π/4 × bore² × stroke × cylinders, in the cube of the input unit. */
export function displacement(bore: number, stroke: number, cylinders: number): number {
  return (Math.PI / 4) * bore * bore * stroke * cylinders;
}

/** Displacement in litres from bore and stroke in millimetres. */
export const displacementLitres = (boreMm: number, strokeMm: number, cylinders: number) =>
  displacement(boreMm, strokeMm, cylinders) / 1e6;
