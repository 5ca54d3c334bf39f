// midi-writer-js ships its types but its package.json "exports" does not point at them.
declare module 'midi-writer-js' {
  import MidiWriter from '../../node_modules/midi-writer-js/build/types/main'

  export default MidiWriter
}
