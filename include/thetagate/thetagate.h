// The whole public interface of thetagate: include this, link
// thetagate::thetagate (find_package(thetagate)).
#ifndef THETAGATE_THETAGATE_H_
#define THETAGATE_THETAGATE_H_

#include "thetagate/check.h"
#include "thetagate/claim.h"
#include "thetagate/cost.h"
#include "thetagate/derive.h"
#include "thetagate/errors.h"
#include "thetagate/evaluate.h"
#include "thetagate/recheck.h"
#include "thetagate/report.h"
#include "thetagate/version.h"

#endif  // THETAGATE_THETAGATE_H_
