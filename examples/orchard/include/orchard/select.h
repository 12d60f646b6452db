// orchard::select_nth: median-of-medians selection (M. Blum, R. W. Floyd,
// V. Pratt, R. L. Rivest, R. E. Tarjan, "Time bounds for selection", 1973).
// Its comparison count is the claim "orchard::select_nth / comparisons, as
// implemented" (claims/search.toml):
//   n <= 20: an insertion sort, at most n(n-1)/2 comparisons;
//   else: groups of five sorted (at most 10 per group, 2n + 6 in all), the
//   median of the ceil(n/5) medians found recursively, a three-way partition
//   (at most 2 per element), and a recursion on one side, which holds at most
//   7n/10 + 6 elements.
#ifndef ORCHARD_SELECT_H_
#define ORCHARD_SELECT_H_

#include <cstddef>
#include <functional>
#include <vector>

namespace orchard {

namespace detail {

template <class T, class Less>
void insertion_sort(T* first, size_t n, Less& less) {
  for (size_t i = 1; i < n; ++i) {
    for (size_t j = i; j > 0 && less(first[j], first[j - 1]); --j)
      std::swap(first[j], first[j - 1]);
  }
}

template <class T, class Less>
T select(std::vector<T> v, size_t k, Less& less) {
  while (true) {
    size_t n = v.size();
    if (n <= 20) {
      insertion_sort(v.data(), n, less);
      return v[k];
    }
    std::vector<T> medians;
    medians.reserve((n + 4) / 5);
    for (size_t g = 0; g < n; g += 5) {
      size_t size = std::min<size_t>(5, n - g);
      insertion_sort(v.data() + g, size, less);
      medians.push_back(v[g + (size - 1) / 2]);
    }
    size_t m = medians.size();
    T pivot = select(std::move(medians), (m - 1) / 2, less);
    std::vector<T> below, above;
    size_t equal = 0;
    for (const T& x : v) {
      if (less(x, pivot)) {
        below.push_back(x);
      } else if (less(pivot, x)) {
        above.push_back(x);
      } else {
        ++equal;
      }
    }
    if (k < below.size()) {
      v = std::move(below);
    } else if (k < below.size() + equal) {
      return pivot;
    } else {
      k -= below.size() + equal;
      v = std::move(above);
    }
  }
}

}  // namespace detail

// The element that would be at index k if `v` were sorted by `less`.
// REQUIRES: k < v.size().
template <class T, class Less = std::less<>>
T select_nth(std::vector<T> v, size_t k, Less less = Less()) {
  return detail::select(std::move(v), k, less);
}

}  // namespace orchard

#endif  // ORCHARD_SELECT_H_
