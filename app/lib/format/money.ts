import { formatDollars } from "~/domain/number-text";

/** Integer cents → "$1,234.50". */
export function formatMoney(cents: number): string {
  return formatDollars(cents / 100, 2);
}

/** Integer cents → "$1,250" (whole dollars, for ranges). */
export function formatMoneyWhole(cents: number): string {
  return formatDollars(Math.round(cents / 100), 0);
}
