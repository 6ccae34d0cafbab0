/** The IANA zones this server knows, for the time zone select (computed on the server so client and server render the same list). */
export function timeZoneOptions(): string[] {
  const zones = Intl.supportedValuesOf("timeZone");
  return zones.includes("UTC") ? zones : ["UTC", ...zones];
}
