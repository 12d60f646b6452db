// Root counting in a disk (Pellet's theorem after Graeffe root-squaring),
// which certifies that a linear recurrence's dominant root dominates.
#include "verifier/numbers/polynomial.h"

#include <gtest/gtest.h>
#include <rapidcheck/gtest.h>

#include <cstdlib>
#include <vector>

namespace thetagate::engine {
namespace {

// The monic polynomial with the given integer roots.
Polynomial with_roots(const std::vector<int>& roots) {
  Polynomial p({Rational(1)});
  for (int r : roots) p = p * Polynomial({Rational(-r), Rational(1)});
  return p;
}

TEST(Polynomial, RootSquaringSquaresTheRoots) {
  // Common practice (Graeffe): (x - 2)(x + 3) becomes (x - 4)(x - 9).
  EXPECT_EQ(with_roots({2, -3}).root_squared(), with_roots({4, 9}));
  // Odd degree: the sign convention keeps the result monic.
  EXPECT_EQ(with_roots({1, -2, 3}).root_squared(), with_roots({1, 4, 9}));
}

TEST(Polynomial, CertifiesTheCountInsideADisk) {
  // x^2 - x - 1: roots (1 ± √5)/2 = 1.618…, −0.618… (from memory).
  Polynomial golden({Rational(-1), Rational(-1), Rational(1)});
  EXPECT_TRUE(golden.certify_roots_inside(Rational(1), 1));
  EXPECT_FALSE(golden.certify_roots_inside(Rational(1), 0));
  EXPECT_FALSE(golden.certify_roots_inside(Rational(1), 2));
  EXPECT_TRUE(golden.certify_roots_inside(Rational(1, 2), 0));
  EXPECT_TRUE(golden.certify_roots_inside(Rational(17, 10), 2));
  // A radius on a root's circle is never certified.
  EXPECT_FALSE(with_roots({1, -2}).certify_roots_inside(Rational(2), 1));
  EXPECT_FALSE(with_roots({1, -2}).certify_roots_inside(Rational(2), 2));
}

RC_GTEST_PROP(Polynomial, ACertifiedCountIsTheTrueCount, ()) {
  // Integer roots, and radii halfway between integers: when the test says
  // "k inside", exactly k roots have modulus below the radius.
  auto roots = *rc::gen::container<std::vector<int>>(static_cast<size_t>(*rc::gen::inRange(1, 6)),
                                                     rc::gen::inRange(-9, 10));
  Polynomial p = with_roots(roots);
  int twice_radius = 2 * *rc::gen::inRange(0, 10) + 1;
  Rational radius(twice_radius, 2);
  int inside = 0;
  for (int r : roots) inside += 2 * std::abs(r) < twice_radius;
  for (int k = 0; k <= p.degree(); ++k) {
    if (p.certify_roots_inside(radius, k)) RC_ASSERT(k == inside);
  }
  // Moduli differ by at least 1/2 from the radius, so eight squarings
  // separate them: the true count is certified.
  RC_ASSERT(p.certify_roots_inside(radius, inside));
}

}  // namespace
}  // namespace thetagate::engine
