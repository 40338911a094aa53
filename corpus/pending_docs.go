package corpus

import "errors"

// The PDF, DOCX and record readers are written next; until then these
// formats are reported as not yet readable.
var errDocsNotYet = errors.New("unsupported file type (reader not available yet)")

func readPDF(string, []byte, *Options) ([]Document, []Skip, error)   { return nil, nil, errDocsNotYet }
func readDOCX(string, []byte, *Options) ([]Document, []Skip, error)  { return nil, nil, errDocsNotYet }
func readCSV(string, []byte, *Options) ([]Document, []Skip, error)   { return nil, nil, errDocsNotYet }
func readTSV(string, []byte, *Options) ([]Document, []Skip, error)   { return nil, nil, errDocsNotYet }
func readJSONL(string, []byte, *Options) ([]Document, []Skip, error) { return nil, nil, errDocsNotYet }
