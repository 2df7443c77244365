import { describe, expect, it } from 'vitest'
import { decodeStripeForm, MalformedFormKey } from '../../../scripts/lib/stripe-fake/form-body'

// Stripe's form encoding as the official SDKs produce it: nested objects in brackets, arrays by index, `[]` pushes.
describe('decodeStripeForm', () => {
  it('decodes nested objects and indexed arrays', () => {
    const body = [
      'mode=payment',
      'line_items[0][price_data][currency]=eur',
      'line_items[0][price_data][product_data][name]=Laser%20cutter%20minutes',
      'line_items[0][quantity]=45',
      'line_items[1][price_data][currency]=eur',
      'line_items[1][quantity]=1',
      'payment_intent_data[metadata][booking_id]=bk_demo_17',
    ].join('&')
    expect(decodeStripeForm(body)).toEqual({
      mode: 'payment',
      line_items: [
        { price_data: { currency: 'eur', product_data: { name: 'Laser cutter minutes' } }, quantity: '45' },
        { price_data: { currency: 'eur' }, quantity: '1' },
      ],
      payment_intent_data: { metadata: { booking_id: 'bk_demo_17' } },
    })
  })

  it('orders array items by index, not by arrival, and keeps every `[]` push', () => {
    expect(decodeStripeForm('items[1]=second&items[0]=first&items[10]=eleventh')).toEqual({ items: ['first', 'second', 'eleventh'] })
    expect(decodeStripeForm('expand[]=payment_intent&expand[]=line_items')).toEqual({ expand: ['payment_intent', 'line_items'] })
  })

  it('accepts percent-encoded brackets and keeps an empty value', () => {
    expect(decodeStripeForm('metadata%5Bnote%5D=a%26b&metadata%5Bempty%5D=')).toEqual({ metadata: { note: 'a&b', empty: '' } })
  })

  it('rejects prototype keys and malformed brackets', () => {
    for (const body of ['__proto__[polluted]=1', 'metadata[constructor]=1', 'a[b=1', 'a]b[=1']) {
      expect(() => decodeStripeForm(body)).toThrow(MalformedFormKey)
    }
    expect(({} as Record<string, unknown>).polluted).toBeUndefined()
  })
})
