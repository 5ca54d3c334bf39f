// `npm run bench`: speed figures for the engine, printed (never asserted: the machine is shared).
import { benchGrade } from './grade'
import { benchSuggest } from './suggest'

benchSuggest()
benchGrade()
