declare module "spdx-expression-parse" {
  /** Parses an SPDX license expression; throws on one that is not valid. */
  export default function parse(expression: string): unknown;
}
