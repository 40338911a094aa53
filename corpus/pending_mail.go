package corpus

import "errors"

// The mail and HTML readers are written next; until then these formats are
// reported as not yet readable.
var errMailNotYet = errors.New("unsupported file type (reader not available yet)")

func readMail(string, []byte, *Options) ([]Document, []Skip, error) { return nil, nil, errMailNotYet }
func readMbox(string, []byte, *Options) ([]Document, []Skip, error) { return nil, nil, errMailNotYet }
func readHTML(string, []byte, *Options) ([]Document, []Skip, error) { return nil, nil, errMailNotYet }
