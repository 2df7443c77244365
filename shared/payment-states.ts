// A booking's payment state in words, for every page that shows one: never the code, never colour alone.
export const PAYMENT_STATE_LABELS: Record<string, string> = {
  awaiting: 'Waiting for payment',
  authorised: 'Held on card',
  captured: 'Paid',
  released: 'Hold released — nothing charged',
  refunded: 'Refunded',
  'partly-refunded': 'Partly refunded',
  'balance-due': 'Balance to pay',
}
