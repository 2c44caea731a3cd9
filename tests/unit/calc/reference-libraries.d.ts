// Type shims for the two npm reference libraries the engine tests check against
// (neither ships its own types). Only the calls the tests make are declared.
declare module "fft.js" {
  export default class FFT {
    constructor(size: number);
    readonly size: number;
    createComplexArray(): number[];
    realTransform(output: number[], input: ArrayLike<number>): void;
    completeSpectrum(spectrum: number[]): void;
  }
}

declare module "bessel" {
  /** J_n(x); note the (x, n) argument order. */
  export function besselj(x: number, n: number): number;
}
