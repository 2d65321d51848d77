// The results table of a fault hunt sorts by any column, by keyboard-reachable header buttons,
// and says so with aria-sort; rows without a value sort last.
import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import HuntsResultsTable from '~/components/hunts/HuntsResultsTable.vue'
import type { ResultRow } from '~/utils/hunt-views'

const row = (student: string, change: Partial<ResultRow>): ResultRow => ({
  attemptId: 1, studentId: student.length * 7 + student.charCodeAt(0), student, email: `${student.toLowerCase()}@riverbend.test`,
  status: 'submitted', probesUsed: 0, unsafeClosures: 0, liveRewires: 0, operations: 0, timeSpentSeconds: 60,
  correct: true, startedAt: '2027-01-10T09:00:00.000Z', submittedAt: '2027-01-10T09:30:00.000Z', ...change,
})
const rows: ResultRow[] = [
  row('Priya', { probesUsed: 7, correct: true, submittedAt: '2027-01-10T10:00:00.000Z' }),
  row('Tomasz', { probesUsed: 12, correct: false, unsafeClosures: 1, submittedAt: '2027-01-10T09:00:00.000Z' }),
  row('Amara', { probesUsed: 3, status: 'in-progress', correct: null, submittedAt: null }),
  row('Bo', { probesUsed: 0, status: 'not-started', correct: null, submittedAt: null, attemptId: null, startedAt: null, timeSpentSeconds: 0 }),
]

async function mountTable() {
  const wrapper = await mountSuspended(HuntsResultsTable, { props: { rows } })
  const order = () => wrapper.findAll('tbody tr').map(tr => tr.attributes('data-student'))
  const header = (key: string) => wrapper.get(`button[data-sort="${key}"]`)
  const sortOf = (key: string) => header(key).element.parentElement!.getAttribute('aria-sort')
  return { wrapper, order, header, sortOf }
}

describe('the hunt results table', () => {
  it('starts by student name, A to Z', async () => {
    const { order, sortOf } = await mountTable()
    expect(order()).toEqual(['Amara', 'Bo', 'Priya', 'Tomasz'])
    expect(sortOf('student')).toBe('ascending')
    expect(sortOf('probesUsed')).toBe('none')
  })

  it('sorts by probes used, then the other way on a second press', async () => {
    const { order, header, sortOf } = await mountTable()
    await header('probesUsed').trigger('click')
    expect(order()).toEqual(['Bo', 'Amara', 'Priya', 'Tomasz'])
    expect(sortOf('probesUsed')).toBe('ascending')
    expect(sortOf('student')).toBe('none')
    await header('probesUsed').trigger('click')
    expect(order()).toEqual(['Tomasz', 'Priya', 'Amara', 'Bo'])
    expect(sortOf('probesUsed')).toBe('descending')
  })

  it('puts students without a diagnosis or a submission last in either direction', async () => {
    const { order, header } = await mountTable()
    await header('correct').trigger('click')
    expect(order()).toEqual(['Tomasz', 'Priya', 'Amara', 'Bo'])
    await header('correct').trigger('click')
    expect(order()).toEqual(['Priya', 'Tomasz', 'Amara', 'Bo'])
    await header('submittedAt').trigger('click')
    expect(order()).toEqual(['Tomasz', 'Priya', 'Amara', 'Bo'])
    await header('status').trigger('click')
    expect(order()).toEqual(['Bo', 'Amara', 'Priya', 'Tomasz'])
  })

  it('says right and wrong in words, and marks an unsafe closure with an icon and words', async () => {
    const { wrapper } = await mountTable()
    const tomasz = wrapper.get('tr[data-student="Tomasz"]').text()
    expect(tomasz).toContain('Wrong')
    expect(tomasz).toContain('(closed onto a fault)')
    expect(wrapper.get('tr[data-student="Priya"]').text()).toContain('Right')
    expect(wrapper.get('tr[data-student="Amara"]').text()).toContain('Not yet')
    expect(wrapper.get('caption').text()).toContain('Sorted by student, ascending')
  })
})
