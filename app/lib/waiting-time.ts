/** How long something has waited, from whole minutes: "3 d 4 h", "5 h 20 min", "12 min". */
export function waitingText(minutes: number): string {
  const whole = Math.max(0, Math.floor(minutes));
  const days = Math.floor(whole / 1440);
  const hours = Math.floor((whole % 1440) / 60);
  const rest = whole % 60;
  if (days > 0) return `${days} d ${hours} h`;
  if (hours > 0) return `${hours} h ${rest} min`;
  return `${rest} min`;
}
