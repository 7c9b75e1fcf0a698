/** "127.0.0.1:3671"; an IPv6 address in brackets so the port stays readable. */
export function hostPort(address: string, port: number): string {
  return address.includes(":") ? `[${address}]:${port}` : `${address}:${port}`;
}
