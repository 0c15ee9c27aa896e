// seedrandom ships one CommonJS file per algorithm; @types/seedrandom only types the index.
declare module 'seedrandom/lib/xor4096' {
  interface Xor4096State {
    X: number[];
    i: number;
    w: number;
  }
  interface Xor4096Prng {
    (): number;
    int32(): number;
    double(): number;
    quick(): number;
    state(): Xor4096State;
  }
  function xor4096(seed: string | number, options?: { state?: boolean | Xor4096State }): Xor4096Prng;
  export = xor4096;
}
