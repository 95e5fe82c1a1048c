/**
 * Typed declaration for fft.js 4.0.4 (its bundled declaration types every argument as `any`), a
 * development dependency: the product runs its own kernel (src/analysis/spectrum/realFft.ts) and
 * spectrum.test.ts beside this file uses fft.js as an independent reference FFT.
 * Contract taken from the library's source: the size must be a power of two greater than 1,
 * `realTransform` writes bins 0…size/2 of an interleaved [re, im, re, im, …] buffer of length
 * 2·size and refuses to work in place.
 */
declare module 'fft.js' {
  type RealBuffer = Float64Array | number[];
  class FFT {
    constructor(size: number);
    readonly size: number;
    createComplexArray(): number[];
    realTransform(out: RealBuffer, data: Float64Array | readonly number[]): void;
    completeSpectrum(spectrum: RealBuffer): void;
    transform(out: RealBuffer, data: Float64Array | readonly number[]): void;
    inverseTransform(out: RealBuffer, data: Float64Array | readonly number[]): void;
  }
  export = FFT;
}
