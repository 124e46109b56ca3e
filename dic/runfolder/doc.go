// Package runfolder owns a run folder's own files, below every stage that
// fills it: atomic writes (WriteAtomic, WriteJSON: a file that exists is
// complete), run.json and its sections (Section, SetSection), the
// displacement field files fields/<frame>.csv (WriteField, ReadField), the
// track, load and acoustic-emission records, and a strict CSV reader whose
// errors name the file and line.
//
// It knows nothing of strain or drawing: the strain, zone and onset files
// are in strain/strainfile, and the stages that write them live with the
// job (cmd/spallscope/internal/stage).
package runfolder
