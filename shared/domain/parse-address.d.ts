// Typings for the members of `parse-address` (US street address parser, ISC) that shared/domain/address.ts calls.
declare module 'parse-address' {
  export interface ParsedAddress {
    number?: string;
    prefix?: string;
    street?: string;
    type?: string;
    suffix?: string;
    sec_unit_type?: string;
    sec_unit_num?: string;
    city?: string;
    state?: string;
    zip?: string;
    plus4?: string;
  }
  export function parseInformalAddress(address: string): ParsedAddress | null;
  export function parseLocation(address: string): ParsedAddress | null;
  export function parseAddress(address: string): ParsedAddress | null;
  const parser: {
    parseInformalAddress: typeof parseInformalAddress;
    parseLocation: typeof parseLocation;
    parseAddress: typeof parseAddress;
  };
  export default parser;
}
