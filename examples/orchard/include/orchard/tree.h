// orchard::tree::build_balanced: a balanced search tree from sorted keys. Its
// node allocations are the claim "orchard::tree::build_balanced / nodes
// allocated" (claims/trees.toml): the root, then the floor(n/2) keys on its
// left and the n - floor(n/2) - 1 on its right; exactly n.
#ifndef ORCHARD_TREE_H_
#define ORCHARD_TREE_H_

#include <cstddef>
#include <memory>
#include <vector>

namespace orchard::tree {

struct Node {
  int key = 0;
  std::unique_ptr<Node> left, right;
};

// `allocate()` returns a new, empty node (the counted operation).
template <class Allocate>
std::unique_ptr<Node> build_balanced(const int* keys, size_t n, Allocate& allocate) {
  if (n == 0) return nullptr;
  size_t half = n / 2;
  std::unique_ptr<Node> root = allocate();
  root->key = keys[half];
  root->left = build_balanced(keys, half, allocate);
  root->right = build_balanced(keys + half + 1, n - half - 1, allocate);
  return root;
}

// REQUIRES: keys sorted.
template <class Allocate>
std::unique_ptr<Node> build_balanced(const std::vector<int>& keys, Allocate allocate) {
  return build_balanced(keys.data(), keys.size(), allocate);
}

inline size_t height(const Node* node) {
  if (node == nullptr) return 0;
  return 1 + std::max(height(node->left.get()), height(node->right.get()));
}

}  // namespace orchard::tree

#endif  // ORCHARD_TREE_H_
