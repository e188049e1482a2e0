// Types for the reference implementation the label-code tests check against.
declare module 'calculate-luhn-mod-n' {
  function calculateLuhnModN(
    codePointFromCharacter: (character: string) => number,
    characterFromCodePoint: (codePoint: number) => string,
    n: number,
    input: string,
  ): string;
  export = calculateLuhnModN;
}
