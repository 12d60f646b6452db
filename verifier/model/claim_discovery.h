// Finding claim files: command-line paths (files and folders) to the list
// of claim files to read (verifier/model/claim.h reads each).
#ifndef THETAGATE_VERIFIER_MODEL_CLAIM_DISCOVERY_H_
#define THETAGATE_VERIFIER_MODEL_CLAIM_DISCOVERY_H_

#include <string>
#include <vector>

#include "verifier/model/claim.h"

namespace thetagate::engine {

// Expands files and folders (folders: every *.toml below, sorted) into the
// list of claim files, in a stable order. Throws InputError for a path that
// does not exist or cannot be reached. Inside a folder, an entry that cannot
// be read (an unlistable folder, a link loop) becomes an error entry in
// `unreadable` and the rest is still found; without `unreadable`, the first
// such entry throws.
std::vector<std::string> find_claim_files(const std::vector<std::string>& paths,
                                          std::vector<ClaimEntry>* unreadable = nullptr);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_MODEL_CLAIM_DISCOVERY_H_
