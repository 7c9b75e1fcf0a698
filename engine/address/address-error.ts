/** A group or individual address that could not be parsed; `input` is the text as given. */
export interface AddressError {
  readonly kind: "address.invalid";
  readonly input: string;
  readonly message: string;
}

export function addressError(input: string, message: string): AddressError {
  return { kind: "address.invalid", input, message };
}
