// THETAGATE_API marks what the shared library exports; everything else in it
// is hidden, so a program can use only what include/thetagate/ declares.
#ifndef THETAGATE_EXPORT_H_
#define THETAGATE_EXPORT_H_

#if defined(__GNUC__) || defined(__clang__)
#define THETAGATE_API __attribute__((visibility("default")))
#else
#define THETAGATE_API
#endif

#endif  // THETAGATE_EXPORT_H_
