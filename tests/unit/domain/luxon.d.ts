// luxon ships no types; the few calls the tests make, used as an independent reference for dates.
declare module 'luxon' {
  export class DateTime {
    static fromJSDate(date: Date, opts?: { zone?: string }): DateTime;
    setLocale(locale: string): DateTime;
    toFormat(format: string): string;
    startOf(unit: 'week' | 'day'): DateTime;
    toJSDate(): Date;
  }
}
