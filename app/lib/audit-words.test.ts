import { describe, expect, test } from 'vitest'
import {
  AUDIT_KIND_WORDS,
  describeAuditEntry,
  genericChange,
  keyWords,
  scoreChange,
  type AuditEntryFacts,
} from './audit-words.ts'

const TZ = 'Europe/Oslo'
const lookups = {
  timeZone: TZ,
  terms: { '4': 'Autumn 2026', '9': 'Spring 2027' },
  versions: {
    '31': { title: 'Air-standard Otto cycle', number: 1 },
    '32': { title: 'Air-standard Otto cycle', number: 2 },
  },
}

function entry(over: Partial<AuditEntryFacts>): AuditEntryFacts {
  return {
    kind: 'regrade',
    before: null,
    after: null,
    note: '',
    subject: 'Ada Okafor',
    assignmentTitle: 'Week 9',
    assignmentDueAt: null,
    question: null,
    maxScore: null,
    regrade: null,
    ...over,
  }
}

const netWork = { label: 'Net work per unit mass', position: 2 }

describe('scores and keys in words', () => {
  test('a score change says the new maximum once; an unchanged score says where it stayed', () => {
    expect(scoreChange(1.5, 3, 3)).toBe('score 1.5 → 3 of 3')
    expect(scoreChange(2.857142, 0, 4.285714)).toBe('score 2.86 → 0 of 4.29')
    expect(scoreChange(1, 1, 2)).toBe('score 1 of 2')
    expect(scoreChange(null, 2, null)).toBe('score none → 2')
  })

  test('field names become words', () => {
    expect(keyWords('lateDaysAllowed')).toBe('late days allowed')
    expect(keyWords('studentsWithoutSection')).toBe('students without section')
  })
})

describe('each kind written today', () => {
  test('a regrade names the question by its label, the versions and the grade’s change — never the field or output path', () => {
    const w = describeAuditEntry(
      entry({
        kind: 'regrade',
        before: { verdict: 'incorrect', score: 1.5 },
        after: { verdict: 'correct', score: 3 },
        note: 'Regrade 12',
        question: netWork,
        maxScore: 3,
        regrade: { fromVersion: 1, toVersion: 2 },
      }),
      lookups,
    )
    expect(w.kind).toBe('Regrade')
    expect(w.what).toBe('Regrade of “Net work per unit mass” (problem 2), version 1 → 2 for Ada Okafor')
    expect(w.change).toBe('incorrect → correct; score 1.5 → 3 of 3')
    expect(w.note).toBe('')
    expect(JSON.stringify(w)).not.toMatch(/wNet|totals\.netWork|Regrade 12/)
  })

  test('a regrade with a new tolerance on the same version, and one whose question the new version dropped', () => {
    const same = describeAuditEntry(
      entry({
        before: { verdict: 'incorrect', score: 0 },
        after: { verdict: 'correct', score: 3 },
        note: 'Regrade 3',
        question: netWork,
        maxScore: 3,
        regrade: { fromVersion: 2, toVersion: 2 },
      }),
      lookups,
    )
    expect(same.what).toContain('version 2 with a new tolerance')
    const dropped = describeAuditEntry(
      entry({
        before: { verdict: 'correct', score: 3 },
        after: { verdict: 'incorrect', score: 0 },
        note: 'Regrade 4: the find is not part of the new version',
        question: netWork,
        maxScore: 0,
        regrade: { fromVersion: 1, toVersion: 2 },
      }),
      lookups,
    )
    expect(dropped.change).toBe('correct → no longer asked; score 3 → 0')
    expect(dropped.note).toBe('The new version no longer asks this question.')
  })

  test('a dispute’s score change, its raising and its resolution', () => {
    const changed = describeAuditEntry(
      entry({
        kind: 'dispute',
        before: { verdict: 'incorrect', score: 0 },
        after: { verdict: 'correct', score: 3 },
        note: 'Accepted on review',
        question: netWork,
        maxScore: 3,
      }),
      lookups,
    )
    expect(changed.what).toBe(
      'Score of Ada Okafor on “Net work per unit mass” (problem 2) changed on review of a dispute',
    )
    expect(changed.change).toBe('incorrect → correct; score 0 → 3 of 3')
    expect(changed.note).toBe('Accepted on review')

    const raised = describeAuditEntry(
      entry({
        kind: 'dispute-raised',
        after: { disputeId: 7, findName: 'wNet' },
        note: 'My sign follows the notes.',
        question: netWork,
      }),
      lookups,
    )
    expect(raised.what).toBe('Ada Okafor disputed the grade on “Net work per unit mass” (problem 2)')
    expect(raised.change).toBeNull()

    const resolved = describeAuditEntry(
      entry({
        kind: 'dispute-resolved',
        before: { disputeId: 7, status: 'open', score: 1.5 },
        after: { disputeId: 7, status: 'upheld', score: 3, changed: 4, partResultIds: [1, 2, 3, 4] },
        question: netWork,
        maxScore: 3,
      }),
      lookups,
    )
    // 'upheld' is said as on the dispute's badge and in the student's e-mail (labels.ts)
    expect(resolved.what).toBe(
      'Dispute of Ada Okafor on “Net work per unit mass” (problem 2) resolved: answer accepted',
    )
    expect(resolved.change).toBe('score 1.5 → 3 of 3; 4 answers changed')
    const kept = describeAuditEntry(
      entry({
        kind: 'dispute-resolved',
        before: { status: 'open', score: 1 },
        after: { status: 'rejected', score: 1, changed: 0 },
        question: netWork,
        maxScore: 3,
      }),
      lookups,
    )
    expect(kept.change).toBe('score 1 of 3')
    expect(kept.what).toMatch(/resolved: score kept$/)
  })

  test('extensions: given, changed and removed, dates in the course zone', () => {
    const due = '2026-10-12T15:00:00.000Z' // 17:00 in Oslo (summer time)
    const given = describeAuditEntry(
      entry({
        kind: 'extension',
        before: null,
        after: { dueAt: '2026-10-14T15:00:00.000Z', extraAttempts: 1, reason: 'Ill' },
        note: 'Ill',
        assignmentDueAt: due,
      }),
      lookups,
    )
    expect(given.what).toBe('Extension given to Ada Okafor')
    expect(given.change).toBe(
      'due Mon 12 Oct 2026, 17:00 (the assignment’s) → due Wed 14 Oct 2026, 17:00, 1 extra attempt',
    )
    expect(given.note).toBe('Ill')

    const changed = describeAuditEntry(
      entry({
        kind: 'extension',
        before: { dueAt: '2026-10-14T15:00:00.000Z', extraAttempts: 1, reason: 'Ill' },
        after: { dueAt: '2026-10-16T15:00:00.000Z', extraAttempts: 2, reason: 'Ill for longer' },
        assignmentDueAt: due,
      }),
      lookups,
    )
    expect(changed.change).toBe(
      'due Wed 14 Oct 2026, 17:00 → Fri 16 Oct 2026, 17:00; extra attempts 1 → 2; reason changed',
    )

    const removed = describeAuditEntry(
      entry({
        kind: 'extension',
        before: { dueAt: null, extraAttempts: 2, reason: '' },
        after: null,
        assignmentDueAt: due,
      }),
      lookups,
    )
    expect(removed.what).toBe('Extension of Ada Okafor removed')
    expect(removed.change).toBe(
      'due Mon 12 Oct 2026, 17:00 (the assignment’s), 2 extra attempts → due Mon 12 Oct 2026, 17:00 (the assignment’s)',
    )
  })

  test('releases', () => {
    const key = describeAuditEntry(
      entry({
        kind: 'key-released',
        subject: null,
        before: { keyReleasedAt: null },
        after: { keyReleasedAt: '2026-12-01T08:30:00.000Z' },
      }),
      lookups,
    )
    expect(key.what).toBe('Key and worked solutions of “Week 9” released')
    expect(key.change).toBe('released Tue 1 Dec 2026, 09:30')
    const grades = describeAuditEntry(
      entry({
        kind: 'grades-released',
        subject: null,
        before: { gradesReleasedAt: null },
        after: { gradesReleasedAt: '2026-12-01T08:30:00.000Z', mailed: 31 },
      }),
      lookups,
    )
    expect(grades.what).toBe('Grades of “Week 9” released')
    expect(grades.change).toBe('31 students e-mailed')
    const onTime = describeAuditEntry(
      entry({
        kind: 'grades-released',
        subject: null,
        after: { gradesReleasedAt: '2026-12-01T08:30:00.000Z', mailed: 2, early: false },
      }),
      lookups,
    )
    expect(onTime.what).toBe('Grades of “Week 9” released')
    expect(onTime.change).toBe('2 students e-mailed')
  })

  test('grades released early say so', () => {
    const early = describeAuditEntry(
      entry({
        kind: 'grades-released',
        subject: null,
        before: { gradesReleasedAt: null },
        after: { gradesReleasedAt: '2026-12-01T08:30:00.000Z', mailed: 1, early: true },
      }),
      lookups,
    )
    expect(early.what).toBe('Grades of “Week 9” released early')
    expect(early.change).toBe('1 student e-mailed; released before every student’s window closed')
  })

  test('a deleted assignment is named by the title it had, with its dates and what went with it', () => {
    const before = {
      title: 'Week 10: Rankine',
      opensAt: '2026-12-07T07:00:00.000Z',
      dueAt: '2026-12-14T16:00:00.000Z',
      items: 3,
      extensions: 1,
    }
    // The assignment row is gone, so the server finds no title of its own for the entry.
    const w = describeAuditEntry(
      entry({ kind: 'assignment-deleted', subject: null, assignmentTitle: null, before, after: null }),
      lookups,
    )
    expect(w.kind).toBe('Assignment deleted')
    expect(w.what).toBe('Assignment “Week 10: Rankine” deleted (nobody had answered it)')
    expect(w.change).toBe(
      'opened Mon 7 Dec 2026, 08:00; due Mon 14 Dec 2026, 17:00; 3 problems; 1 extension removed with it',
    )
    const bare = describeAuditEntry(
      entry({
        kind: 'assignment-deleted',
        subject: null,
        assignmentTitle: null,
        before: { title: 'Quiz', items: 0, extensions: 0 },
        after: null,
      }),
      lookups,
    )
    expect(bare.what).toBe('Assignment “Quiz” deleted (nobody had answered it)')
    expect(bare.change).toBe('0 problems')
  })

  test('an assignment’s changed settings, each in words, problems by title and version', () => {
    const w = describeAuditEntry(
      entry({
        kind: 'assignment-changed',
        subject: null,
        before: {
          dueAt: '2026-10-12T15:00:00.000Z',
          attemptsPerFind: 3,
          latePolicy: 'closed',
          latePenaltyPercentPerDay: 0,
          keyRelease: 'after-due',
          title: 'Week 9',
          items: [{ versionId: 31, points: 10 }],
        },
        after: {
          dueAt: '2026-10-14T15:00:00.000Z',
          attemptsPerFind: 5,
          latePolicy: 'penalty',
          latePenaltyPercentPerDay: 10,
          keyRelease: 'manual',
          title: 'Week 9: gas cycles',
          items: [{ versionId: 32, points: 12 }],
        },
      }),
      lookups,
    )
    expect(w.what).toBe('“Week 9” changed')
    expect(w.change).toBe(
      [
        'due Mon 12 Oct 2026, 17:00 → Wed 14 Oct 2026, 17:00',
        'attempts per question 3 → 5',
        'late answers: no late answers → late answers with a penalty',
        'late penalty 0 % → 10 % per day',
        'key released after the due date → by hand',
        'title “Week 9” → “Week 9: gas cycles”',
        'problems: 1. Air-standard Otto cycle (version 1), 10 points → 1. Air-standard Otto cycle (version 2), 12 points',
      ].join('; '),
    )
    expect(w.change).not.toMatch(/versionId|attemptsPerFind|latePolicy/)
  })

  test('courses: created, settings changed, copied — terms by name', () => {
    const created = describeAuditEntry(
      entry({
        kind: 'course-created',
        subject: null,
        assignmentTitle: null,
        after: {
          code: 'ENTH 210',
          title: 'Engineering Thermodynamics I',
          termId: 4,
          signConvention: 'engineering',
          timeZone: TZ,
        },
      }),
      lookups,
    )
    expect(created.what).toBe('Course ENTH 210 “Engineering Thermodynamics I” created')
    expect(created.change).toBe('in Autumn 2026, engineering sign convention, times in Europe/Oslo')

    const settings = describeAuditEntry(
      entry({
        kind: 'course-settings-changed',
        subject: null,
        before: { title: 'Old', timeZone: 'UTC' },
        after: { title: 'New', timeZone: TZ },
      }),
      lookups,
    )
    expect(settings.change).toBe('title “Old” → “New”; time zone UTC → Europe/Oslo')

    const copied = describeAuditEntry(
      entry({
        kind: 'course-copied',
        subject: null,
        before: { courseId: 3, code: 'ENTH 210', termId: 4 },
        after: {
          courseId: 8,
          code: 'ENTH 210',
          termId: 9,
          offsetDays: 182,
          assignments: [
            { from: 1, to: 2 },
            { from: 3, to: 4 },
          ],
          instructors: 2,
        },
        note: 'Copied from ENTH 210; dates moved by 182 days',
      }),
      lookups,
    )
    expect(copied.what).toBe('Copied from ENTH 210 (Autumn 2026) to ENTH 210 (Spring 2027)')
    expect(copied.change).toBe('2 assignments copied, dates moved later by 182 days, 2 instructors')
  })

  test('people and the roster', () => {
    expect(
      describeAuditEntry(
        entry({
          kind: 'instructor-added',
          subject: 'Tobias Wrenfield',
          before: { role: 'ta' },
          after: { role: 'instructor' },
        }),
        lookups,
      ),
    ).toMatchObject({
      what: 'Tobias Wrenfield made an instructor',
      change: 'role teaching assistant → instructor',
    })
    expect(
      describeAuditEntry(
        entry({ kind: 'instructor-added', subject: 'New Person', before: null, after: { role: 'instructor' } }),
        lookups,
      ).change,
    ).toBe('added to the course as instructor')
    const imported = describeAuditEntry(
      entry({
        kind: 'roster-import',
        subject: null,
        after: { rows: 40, new: 30, add: 5, update: 2, unchanged: 3, error: 0, invited: 35, newSections: ['L1', 'L2'] },
        note: 'From class.csv',
      }),
      lookups,
    )
    expect(imported.change).toBe(
      '40 rows read, 30 new accounts, 5 existing accounts added, 2 students updated, 3 unchanged, 35 invitations sent, new sections “L1”, “L2”',
    )
    expect(imported.note).toBe('From class.csv')
    expect(
      describeAuditEntry(
        entry({
          kind: 'invitation-resent',
          subject: null,
          before: { lastSentAt: '2026-10-01T06:00:00.000Z', expiresAt: '2026-10-15T06:00:00.000Z' },
          after: { invitationId: 5, email: 'ada@example.test' },
        }),
        lookups,
      ),
    ).toMatchObject({
      what: 'Invitation to ada@example.test sent again',
      change: 'last sent Thu 1 Oct 2026, 08:00 → now',
    })
    expect(
      describeAuditEntry(
        entry({ kind: 'invitation-revoked', subject: null, after: { invitationId: 5, email: 'ada@example.test' } }),
        lookups,
      ).what,
    ).toBe('Invitation to ada@example.test withdrawn')
    expect(
      describeAuditEntry(
        entry({
          kind: 'student-dropped',
          before: { droppedAt: null },
          after: { droppedAt: '2026-10-01T06:00:00.000Z' },
        }),
        lookups,
      ).what,
    ).toBe('Ada Okafor dropped from the course')
    expect(
      describeAuditEntry(
        entry({
          kind: 'student-undropped',
          before: { droppedAt: '2026-10-01T06:00:00.000Z' },
          after: { droppedAt: null },
        }),
        lookups,
      ).change,
    ).toBe('dropped on Thu 1 Oct 2026, 08:00 → on the roster')
  })

  test('sections', () => {
    expect(
      describeAuditEntry(
        entry({ kind: 'section-created', subject: null, after: { sectionId: 3, name: 'Lab 1' } }),
        lookups,
      ).what,
    ).toBe('Section “Lab 1” added')
    expect(
      describeAuditEntry(entry({ kind: 'section-created', subject: null, after: { names: ['A', 'B'] } }), lookups).what,
    ).toBe('Sections added: “A”, “B”')
    expect(
      describeAuditEntry(
        entry({
          kind: 'section-renamed',
          subject: null,
          before: { sectionId: 3, name: 'A' },
          after: { sectionId: 3, name: 'Lab A', students: 12 },
        }),
        lookups,
      ),
    ).toMatchObject({
      what: 'Section “A” renamed',
      change: 'name “A” → “Lab A”; 12 students moved with it',
    })
    expect(
      describeAuditEntry(
        entry({
          kind: 'section-deleted',
          subject: null,
          before: { sectionId: 3, name: 'A' },
          after: { studentsWithoutSection: 1 },
        }),
        lookups,
      ).change,
    ).toBe('1 student now without a section')
    expect(
      describeAuditEntry(
        entry({ kind: 'student-section', before: { section: null }, after: { section: 'B' } }),
        lookups,
      ).change,
    ).toBe('no section → section “B”')
    expect(
      describeAuditEntry(
        entry({
          kind: 'section-staff',
          subject: 'Priya Halloran',
          before: { sectionId: 3, name: 'A', assigned: false },
          after: { sectionId: 3, name: 'A', assigned: true },
        }),
        lookups,
      ).what,
    ).toBe('Priya Halloran now looks after section “A”')
    expect(
      describeAuditEntry(
        entry({
          kind: 'section-staff',
          subject: 'Priya Halloran',
          before: { sectionId: 3, name: 'A', assigned: true },
          after: { sectionId: 3, name: 'A', assigned: false },
        }),
        lookups,
      ).what,
    ).toBe('Priya Halloran no longer looks after section “A”')
  })

  test('every kind in the filter list has its own wording (none falls to the generic line)', () => {
    for (const kind of Object.keys(AUDIT_KIND_WORDS)) {
      const w = describeAuditEntry(entry({ kind, before: {}, after: {} }), lookups)
      expect(w.kind).toBe(AUDIT_KIND_WORDS[kind])
      expect(w.what.startsWith(`${AUDIT_KIND_WORDS[kind]} (`)).toBe(false)
    }
  })
})

describe('a kind nobody taught this module', () => {
  test('gets a generic line: the kind in words, changed values in words, ids left out, times in the zone', () => {
    const w = describeAuditEntry(
      entry({
        kind: 'weights-changed',
        before: { weightId: 4, homeworkShare: 0.4, reviewedAt: '2026-10-12T15:00:00.000Z' },
        after: { weightId: 4, homeworkShare: 0.5, reviewedAt: '2026-10-14T15:00:00.000Z', label: 'Final' },
      }),
      lookups,
    )
    expect(w.kind).toBe('Weights changed')
    expect(w.what).toBe('Weights changed (Ada Okafor)')
    expect(w.change).toBe(
      'homework share 0.4 → 0.5; reviewed at Mon 12 Oct 2026, 17:00 → Wed 14 Oct 2026, 17:00; label “Final”',
    )
  })

  test('odd shapes never throw', () => {
    expect(genericChange(null, null, TZ)).toBeNull()
    expect(genericChange(3, 'x', TZ)).toBe('3 → “x”')
    for (const kind of [...Object.keys(AUDIT_KIND_WORDS), 'unknown']) {
      for (const [before, after] of [
        [null, null],
        ['text', 7],
        [[1, 2], { a: [1] }],
        [{ score: 'high' }, { verdict: 42, status: {} }],
      ] as const) {
        expect(() =>
          describeAuditEntry(entry({ kind, before, after, question: null, subject: null, assignmentTitle: null }), {
            timeZone: TZ,
          }),
        ).not.toThrow()
      }
    }
  })
})
