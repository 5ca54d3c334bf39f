import { afterAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb } from '../support/server'

afterAll(closeTestDb)

interface DrillList { drills: { id: number, title: string, isPublic: boolean, ownerId: number }[] }

describe('GET /api/drills', () => {
  it('shows a teacher their own drills', async () => {
    const c = await new Client().signIn('teacher@evenhand.test')
    const res = await c.get<DrillList>('/api/drills')
    expect(res.status).toBe(200)
    expect(res.body.drills.length).toBeGreaterThanOrEqual(12)
  })

  it('shows a student assigned drills and the public ones, not the rest', async () => {
    // Theo is only in Tuesday Starters, whose set holds three drills; two more are public.
    const c = await new Client().signIn('theo@evenhand.test')
    const res = await c.get<DrillList>('/api/drills')
    expect(res.status).toBe(200)
    const titles = res.body.drills.map(d => d.title)
    expect(titles).toContain('Five-finger pattern in C, right hand')
    expect(titles).not.toContain('B flat major scale, right hand')
  })

  it('hides a drill the student may not see behind a 404', async () => {
    const teacher = await new Client().signIn('teacher@evenhand.test')
    const hidden = (await teacher.get<DrillList>('/api/drills')).body.drills.find(d => d.title === 'B flat major scale, right hand')!
    const theo = await new Client().signIn('theo@evenhand.test')
    expect((await theo.get(`/api/drills/${hidden.id}`)).status).toBe(404)
    expect((await theo.get('/api/drills/not-a-number')).status).toBe(400)
  })
})
