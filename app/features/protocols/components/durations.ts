/** Minutes in words for the protocol screens: "2 days 30 min", "48 h", "15 min". */
export function minutesInWords(total: number): string {
  if (!Number.isFinite(total)) return '';
  const days = Math.floor(total / 1440);
  const hours = Math.floor((total % 1440) / 60);
  const minutes = total % 60;
  const parts: string[] = [];
  if (days) parts.push(`${days} ${days === 1 ? 'day' : 'days'}`);
  if (hours) parts.push(`${hours} h`);
  if (minutes || parts.length === 0) parts.push(`${minutes} min`);
  return parts.join(' ');
}
