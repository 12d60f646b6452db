// orchard::stable_sort: a top-down merge sort. Its comparison count is the
// claim "orchard::stable_sort / comparisons, worst case" (claims/sorting.toml):
// a merge of a and b elements makes at most a + b - 1 comparisons.
#ifndef ORCHARD_SORT_H_
#define ORCHARD_SORT_H_

#include <algorithm>
#include <cstddef>
#include <functional>
#include <stdexcept>
#include <vector>

namespace orchard {

namespace detail {

template <class T, class Less>
void merge_sort(std::vector<T>& v, size_t lo, size_t hi, std::vector<T>& scratch, Less& less) {
  if (hi - lo < 2) return;
  size_t mid = lo + (hi - lo + 1) / 2;  // the left half takes the odd element
  merge_sort(v, lo, mid, scratch, less);
  merge_sort(v, mid, hi, scratch, less);
  size_t i = lo, j = mid, k = lo;
  while (i < mid && j < hi) {
    if (less(v[j], v[i])) {  // only a strictly smaller right element goes first: stable
      scratch[k++] = v[j++];
#ifdef ORCHARD_REGRESSION
      // The regression: a "defensive" order check after taking from the right
      // run re-compares an element already placed. Correct, and costlier
      // than the documented model.
      if (k - lo >= 2 && less(scratch[k - 1], scratch[k - 2])) throw std::logic_error("unsorted");
#endif
    } else {
      scratch[k++] = v[i++];
    }
  }
  while (i < mid) scratch[k++] = v[i++];
  while (j < hi) scratch[k++] = v[j++];
  std::copy(scratch.begin() + lo, scratch.begin() + hi, v.begin() + lo);
}

}  // namespace detail

// Sorts `v` stably by `less`.
template <class T, class Less = std::less<>>
void stable_sort(std::vector<T>& v, Less less = Less()) {
  std::vector<T> scratch(v.size());
  detail::merge_sort(v, 0, v.size(), scratch, less);
}

}  // namespace orchard

#endif  // ORCHARD_SORT_H_
