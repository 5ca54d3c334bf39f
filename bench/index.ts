// `npm run bench`: speed figures for the engine and the practice store, printed (never asserted: the
// machine is shared). The browser's latency and page size: `npm run bench:browser`.
import { benchGrade } from './grade'
import { benchLibrary } from './library'
import { benchPractice } from './practice'
import { benchRecovery } from './recovery'
import { benchSuggest } from './suggest'

benchSuggest()
benchGrade()
benchPractice()
benchRecovery()
benchLibrary()
