import { describe, expect, it } from 'vitest'
import { h } from 'vue'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import type { DOMWrapper } from '@vue/test-utils'
import { AttemptLink, DataTable, ProgressNumbers } from '#components'

type Mounted = Awaited<ReturnType<typeof mountSuspended>>

const headings = (w: Mounted): (string | undefined)[][] => w.findAll('thead th').map((th: DOMWrapper<Element>) => [th.text(), th.attributes('scope')])

describe('DataTable', () => {
  it('heads every column in order, scoped to its column, with the rows the slot gives', async () => {
    const w = await mountSuspended(DataTable, {
      props: { columns: ['Played', 'Drill', 'Score'], caption: 'Attempts, newest first' },
      slots: { default: () => h('tr', { 'data-testid': 'row' }, [h('td', 'Tue'), h('td', 'C major'), h('td', '88')]) },
    })
    expect(headings(w)).toEqual([['Played', 'col'], ['Drill', 'col'], ['Score', 'col']])
    expect(w.get('caption').text()).toBe('Attempts, newest first')
    expect(w.findAll('tbody tr').map(r => r.attributes('data-testid'))).toEqual(['row'])
  })

  it('says its sentence across every column while there are no rows, and only then', async () => {
    const empty = await mountSuspended(DataTable, { props: { columns: ['Day', 'Minutes', 'Attempts', 'Best'], empty: 'No attempts yet.', none: true } })
    const cell = empty.get('tbody td')
    expect([cell.text(), cell.attributes('colspan')]).toEqual(['No attempts yet.', '4'])
    const full = await mountSuspended(DataTable, { props: { columns: ['Day'], empty: 'No attempts yet.', none: false } })
    expect(full.text()).not.toContain('No attempts yet.')
    expect(full.find('caption').exists()).toBe(false)
  })

  it('puts the heading classes on each heading and other attributes on the table', async () => {
    const w = await mountSuspended(DataTable, { props: { columns: ['For', 'Due'], cell: 'px-5 py-3', headClass: 'muted' }, attrs: { 'data-testid': 'plans' } })
    expect(w.get('table').attributes('data-testid')).toBe('plans')
    expect(w.get('thead').classes()).toContain('muted')
    expect(w.findAll('th').map(th => th.classes())).toEqual([['px-5', 'py-3'], ['px-5', 'py-3']])
  })
})

describe('ProgressNumbers', () => {
  it('folds a captioned table with the given headings behind "Show the numbers"', async () => {
    const w = await mountSuspended(ProgressNumbers, {
      props: { caption: 'Minutes practised per day', columns: ['Day', 'Minutes'] },
      slots: { default: () => h('tr', [h('td', '2026-12-01'), h('td', '4.5')]) },
    })
    expect(w.get('details > summary').text()).toBe('Show the numbers')
    expect(w.get('details table caption').text()).toBe('Minutes practised per day')
    expect(headings(w)).toEqual([['Day', 'col'], ['Minutes', 'col']])
    expect(w.findAll('tbody td').map(td => td.text())).toEqual(['2026-12-01', '4.5'])
  })
})

describe('AttemptLink', () => {
  it('links to the attempt\'s report under the time it was played', async () => {
    const id = '0b7c6a52-4a55-4d5e-9a43-2f0d6b1e7c11'
    const w = await mountSuspended(AttemptLink, { props: { id, at: '2026-11-30T16:05:00.000Z' }, attrs: { class: 'underline' } })
    const link = w.get('a')
    expect([link.attributes('href'), link.classes()]).toEqual([`/attempts/${id}`, ['underline']])
    expect(link.get('time').attributes('datetime')).toBe('2026-11-30T16:05:00.000Z')
  })
})
