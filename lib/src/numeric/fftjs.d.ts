// Types of the parts of fft.js 4 (MIT, npm) that fft.ts uses.
declare module "fft.js" {
  class FFT {
    constructor(size: number);
    readonly size: number;
    createComplexArray(): number[];
    /** Forward transform, interleaved complex (re, im, re, im, ...), out !== data. */
    transform(out: ArrayLike<number> & { [i: number]: number }, data: ArrayLike<number>): void;
  }
  export = FFT;
}
