"""Lemmas with parameters: the classical ones are proved, wrong ones are refused for the right reason."""
import os
import re
from fractions import Fraction

import flint
import pytest
from hypothesis import given, settings, strategies as st

from checker import check_file, check_text
from checker.foundation.resources import resource_dir

from conftest import flint_fraction

LIBRARY = resource_dir("checker.certificates", "certificates") / "dedekind-lemmas.qcert"


def s(h, k):
    return flint_fraction(flint.fmpq.dedekind_sum(h, k))


def failure(text):
    report = check_text(text)
    assert not report.ok, "expected a refusal"
    return report.failures[0]


# -- the published closed forms themselves, against python-flint for every k <= 2000 ---------

def test_s_one_k_closed_form_against_flint():
    # Rademacher & Grosswald, Dedekind Sums (1972): s(1, k) = (k-1)(k-2)/(12k)
    for k in range(1, 2001):
        assert s(1, k) == Fraction((k - 1) * (k - 2), 12 * k), k


def test_s_two_k_closed_form_for_odd_k_against_flint():
    # Rademacher & Grosswald, Dedekind Sums (1972): s(2, k) = (k-1)(k-5)/(24k) for odd k
    for k in range(1, 2001, 2):
        assert s(2, k) == Fraction((k - 1) * (k - 5), 24 * k), k


def test_s_k_minus_one_against_flint():
    # Rademacher & Grosswald, Dedekind Sums (1972): s(k-1, k) = -s(1, k)
    for k in range(1, 2001):
        assert s(k - 1, k) == -s(1, k), k


def test_square_roots_of_minus_one_give_zero_against_flint():
    # Rademacher & Grosswald, Dedekind Sums (1972): s(h, k) = 0 when h^2 = -1 (mod k)
    seen = 0
    for k in range(1, 2001):
        for h in range(k):
            if (h * h + 1) % k == 0:
                assert s(h, k) == 0, (h, k)
                seen += 1
    assert seen == 956        # not vacuous: every such pair with k <= 2000


def test_derived_forms_of_the_library_against_flint():
    # the library's own case-split lemmas, read as formulas, against python-flint
    for k in range(1, 2001):
        assert s(2, k) == Fraction(k * k - 6 * k + 8 - 3 * (k % 2), 24 * k), k
        if k % 3:
            assert s(3, k) == Fraction(k * k - 9 * k + 10 - 2 * k * (3 - 2 * (k % 3)), 36 * k), k
        if k % 2 and k >= 3:
            assert s(k - 2, k) == -Fraction((k - 1) * (k - 5), 24 * k), k
        if k % 6 == 1:
            assert s((k + 2) // 3, k) == Fraction(k * k - 18 * k + 13, 72 * k) + Fraction(1, 18), k


def test_apostol_s3_one_k_against_sympy_bernoulli_polynomials():
    # the library's s_3(1, k) = -(k^2-1)(k^2-4)/(120 k^3), against Apostol's definition
    # sum_{j mod k} (j/k) B_3({j/k}) summed with sympy's exact Bernoulli polynomial B_3
    import sympy
    x = sympy.Symbol("x")
    coefficients = [Fraction(int(c.p), int(c.q)) for c in sympy.Poly(sympy.bernoulli(3, x), x).all_coeffs()]

    def b3(t):
        value = Fraction(0)
        for c in coefficients:
            value = value * t + c
        return value

    for k in range(1, 121):
        total = sum(Fraction(j, k) * b3(Fraction(j, k)) for j in range(k))
        assert total == -Fraction((k * k - 1) * (k * k - 4), 120 * k ** 3), k


# -- the library is proved, and usable -------------------------------------------------------

def test_library_is_proved_symbolically_with_a_second_opinion():
    report = check_file(LIBRARY)
    assert report.ok, report.failures
    notes = [n for n in report.notes if "lemma" in n]
    assert len(notes) == 12
    assert all("replayed symbolically" in n and "instances" in n for n in notes)
    assert any("in 2 residue classes" in n for n in notes)


def test_bundled_lemmas_used_at_numbers_and_with_parameters():
    text = """use "dedekind-lemmas"
chain dedekind(2, 1001) = 1000*996/(24*1001) by lemma two_over_odd(1001)
chain dedekind(3, 1000) = (1000 - 1)*(1000 - 10)/36000 by lemma three_over_k(1000)
lemma five_over_odd(m) for m >= 0:
  dedekind(2, 2*m + 1) = m*(m - 2)/(6*(2*m + 1))
  chain dedekind(2, 2*m + 1) = (2*m)*(2*m - 4)/(24*(2*m + 1)) by lemma two_over_odd(2*m + 1)
end
"""
    report = check_text(text)
    assert report.ok, report.failures


def test_numeric_use_checks_the_assumptions():
    f = failure('use "dedekind-lemmas"\nchain dedekind(2, 100) = 99*95/2400 by lemma two_over_odd(100)\n')
    assert "needs k == 1 mod 2, which is false for k = 100" in f.message
    assert (f.line, f.column) == (2, 46)     # the lemma's name in the step


def test_symbolic_use_checks_the_assumptions():
    text = """use "dedekind-lemmas"
lemma careless(k) for k >= 1:
  dedekind(2, k) = (k - 1)*(k - 5)/(24*k)
  chain dedekind(2, k) = (k - 1)*(k - 5)/(24*k) by lemma two_over_odd(k)
end
"""
    f = failure(text)
    assert "needs k == 1 mod 2, which does not follow for k = k" in f.message
    assert f.line == 4


# -- wrong lemmas, each refused with its reason ------------------------------------------------

TWO_ODD = """lemma two_odd(k) for k >= 1, k == 1 mod 2:
  dedekind(2, k) = (k - 1)*(k - 5)/(24*k)
  chain dedekind(2, k)
    = (2/k + k/2 + 1/(2*k))/12 - 1/4 - dedekind(k, 2)   by reciprocity
    = (2/k + k/2 + 1/(2*k))/12 - 1/4 - dedekind(1, 2)   by reduce
    = (k - 1)*(k - 5)/(24*k)                            by value
end
"""


def test_the_worked_example_is_accepted():
    report = check_text(TWO_ODD)
    assert report.ok and report.checked == 4


def test_false_closed_form_is_caught_by_the_algebra_step():
    f = failure(TWO_ODD.replace("(k - 1)*(k - 5)/(24*k)                            by value",
                                "(k - 1)*(k - 7)/(24*k) by value"))
    assert (f.line, f.column) == (6, 8)
    assert "does not follow by value" in f.message
    assert any("difference (this line - what the rule gives)" in d for d in f.details)
    assert any("at k = 3 the previous line is -1/18 and this line is -1/9" in d for d in f.details)


def test_false_statement_with_a_true_chain_is_caught_at_the_conclusion():
    text = TWO_ODD.replace("dedekind(2, k) = (k - 1)*(k - 5)/(24*k)",
                           "dedekind(2, k) = (k - 1)*(k - 5)/(12*k)")
    f = failure(text)
    assert "the last chain must end at the right side of the statement" in f.message


def test_reciprocity_without_coprimality_names_the_condition():
    f = failure(TWO_ODD.replace("for k >= 1, k == 1 mod 2", "for k >= 1"))
    assert (f.line, f.column) == (4, 8)
    assert "does not follow by reciprocity" in f.message
    assert any("the assumptions do not give gcd(2, k) = 1: k can be 0 (mod 2)" in d for d in f.details)
    assert any("at k = 2" in d for d in f.details)


def test_reduce_whose_residue_is_not_fixed_is_refused():
    text = """lemma guess(k) for k >= 1:
  dedekind(k, 3) = dedekind(1, 3)
  chain dedekind(k, 3) = dedekind(1, 3) by reduce
end
"""
    f = failure(text)
    assert "does not follow by reduce" in f.message
    assert any("the assumptions do not give k - 1 = 0 (mod 3)" in d for d in f.details)


def test_case_split_missing_a_class_is_refused():
    text = """lemma three(k) for k >= 1:
  dedekind(3, k) = (k^2 - 9*k + 10 - 2*k*(3 - 2*mod(k, 3)))/(36*k)
  split k mod 3
  residue 1:
    chain dedekind(3, k) = (3/k + k/3 + 1/(3*k))/12 - 1/4 - dedekind(k, 3) by reciprocity
      = (3/k + k/3 + 1/(3*k))/12 - 1/4 - dedekind(1, 3) by reduce
      = (k - 1)*(k - 10)/(36*k) by value
  residue 2:
    chain dedekind(3, k) = (3/k + k/3 + 1/(3*k))/12 - 1/4 - dedekind(k, 3) by reciprocity
      = (3/k + k/3 + 1/(3*k))/12 - 1/4 - dedekind(2, 3) by reduce
      = (k - 2)*(k - 5)/(36*k) by value
end
"""
    f = failure(text)
    assert "the residues given do not cover k = 0 (mod 3), which the assumptions allow" in f.message
    assert (f.line, f.column) == (3, 3)
    # with gcd(3, k) = 1 assumed, the same two residues cover everything
    assert check_text(text.replace("for k >= 1", "for k >= 1, gcd(3, k) = 1")).ok


def test_case_split_needs_a_parameter_and_distinct_cases():
    text = """lemma twice(k) for k >= 1:
  k = k
  split k mod 2
  residue 1:
    chain k = k by arithmetic
  residue 3:
    chain k = k by arithmetic
end
"""
    assert "is given twice" in failure(text).message


def test_divisor_that_may_vanish_is_refused():
    text = """lemma pole(k) for k >= 1:
  1/(k - 3) = 1/(k - 3)
  chain 1/(k - 3) = 1/(k - 3) by arithmetic
end
"""
    f = failure(text)
    assert "this divisor may be 0: the assumptions do not rule out k - 3 = 0" in f.message


def test_floor_of_an_unfixed_residue_is_refused():
    text = """lemma halves(k) for k >= 1:
  floor(k/2) = k/2
  chain floor(k/2) = k/2 by arithmetic
end
"""
    assert "floor(k/2) is not fixed by the assumptions" in failure(text).message


def test_floor_of_a_fixed_residue_is_simplified():
    text = """lemma halves(k) for k >= 1, k == 1 mod 2:
  floor(k/2) + mod(k, 2) + sawtooth(k/4) = (k + 1)/2 + sawtooth(k/4)
  chain floor(k/2) + mod(k, 2) + sawtooth(k/4) = (k + 1)/2 + sawtooth(k/4) by arithmetic
end
"""
    assert check_text(text).ok


def test_contradictory_assumptions_prove_nothing():
    text = """lemma empty(k) for k >= 5, k <= 2:
  dedekind(1, k) = 7
  chain dedekind(1, k) = 7 by arithmetic
end
"""
    f = failure(text)
    assert "does not follow" in f.message or "no values" in f.message


def test_statement_may_use_only_parameters():
    text = "let q = 5\nlemma x(k) for k >= 1:\n  dedekind(q, k) = 0\n  chain dedekind(q, k) = 0 by arithmetic\nend\n"
    assert "'q' is not a parameter of lemma x" in failure(text).message


def test_planted_bug_in_a_symbolic_rule_is_caught_by_the_second_opinion(monkeypatch):
    from checker.kernel import symbolic_rules
    from checker.kernel.normal import add, scale

    def wrong_negate(facts, limits, atom, target):
        h, k = atom[1]
        return [add(scale(symbolic_rules._call("dedekind", -h, k), Fraction(-1)), {frozenset(): Fraction(1, 1000)})]

    monkeypatch.setitem(symbolic_rules._RULES, "negate", wrong_negate)
    text = """lemma odd_sum(k) for k >= 1:
  dedekind(k - 1, k) = 1/1000 - dedekind(1 - k, k)
  chain dedekind(k - 1, k) = 1/1000 - dedekind(1 - k, k) by negate
end
"""
    report = check_text(text)
    assert report.exit_code == 3
    assert report.failures[0].kind == "checker bug"
    assert "passed its symbolic check but" in report.failures[0].message


# -- use: bundled names, files beside, and hostile paths ---------------------------------------

def test_use_of_a_file_beside(tmp_path):
    (tmp_path / "mine.qcert").write_text(TWO_ODD)
    (tmp_path / "main.qcert").write_text('use "mine.qcert"\nclaim dedekind(2, 7) = 6*2/(24*7)\n'
                                         'chain dedekind(2, 9) = 8*4/(24*9) by lemma two_odd(9)\n')
    assert check_file(tmp_path / "main.qcert").ok


@pytest.mark.parametrize("target, words", [
    ("../x.qcert", "without '..'"),
    ("/etc/passwd.qcert", "without '..'"),
    ("C:/x.qcert", "without '..'"),
    ("Not A Name", "is not a bundled certificate name"),
    ("no-such-lemmas", "there is no bundled certificate"),
])
def test_use_refuses_paths_outside(tmp_path, target, words):
    (tmp_path / "main.qcert").write_text(f'use "{target}"\n')
    report = check_file(tmp_path / "main.qcert")
    assert words in report.failures[0].message
    assert report.failures[0].line == 1


def test_use_refuses_a_symbolic_link_out_of_the_folder(tmp_path):
    outside = tmp_path / "outside.qcert"
    outside.write_text(TWO_ODD)
    inner = tmp_path / "inner"
    inner.mkdir()
    os.symlink(outside, inner / "link.qcert")
    (inner / "main.qcert").write_text('use "link.qcert"\n')
    assert "leads outside this certificate's folder" in check_file(inner / "main.qcert").failures[0].message


def test_use_refuses_cycles(tmp_path):
    (tmp_path / "a.qcert").write_text('use "b.qcert"\n')
    (tmp_path / "b.qcert").write_text('use "a.qcert"\n')
    f = check_file(tmp_path / "a.qcert").failures[0]
    assert "a.qcert uses b.qcert uses a.qcert" in f.message


def test_use_refuses_itself(tmp_path):
    (tmp_path / "a.qcert").write_text('use "a.qcert"\n')
    assert "use makes a cycle" in check_file(tmp_path / "a.qcert").failures[0].message


def test_use_of_a_failing_certificate_says_where_it_fails(tmp_path):
    (tmp_path / "bad.qcert").write_text("claim 1 = 2\n")
    (tmp_path / "main.qcert").write_text('use "bad.qcert"\n')
    f = check_file(tmp_path / "main.qcert").failures[0]
    assert "bad.qcert does not check, so its lemmas cannot be used: bad.qcert:1:" in f.message


def test_text_without_a_folder_uses_bundled_certificates_only():
    assert "can use bundled certificates only" in failure('use "x.qcert"\n').message


def test_lemma_names_do_not_clash():
    assert "already given" in failure(TWO_ODD + TWO_ODD).message


# -- Hypothesis: true identities built from the rules, and corruptions of proved ones -----------

@st.composite
def residue_lemmas(draw):
    """dedekind(a k + b, q) = s(t, q) for k in a class modulo m that q divides (reduce, value)."""
    m = draw(st.integers(2, 12))
    q = draw(st.sampled_from([d for d in range(2, m + 1) if m % d == 0]))
    r = draw(st.integers(0, m - 1))
    a, b = draw(st.integers(-5, 5).filter(bool)), draw(st.integers(-20, 20))
    low = draw(st.integers(-3, 5))
    t = (a * r + b) % q
    value = s(t, q)
    sign = draw(st.booleans())
    start = f"dedekind({-a}*k + {-b}, {q})" if sign else f"dedekind({a}*k + {b}, {q})"
    steps = []
    if sign:
        steps.append((f"-dedekind({a}*k + {b}, {q})", "negate"))
    pre = "-" if sign else ""
    steps.append((f"{pre}dedekind({t}, {q})", "reduce"))
    steps.append((f"{-value if sign else value}", "value"))
    body = "\n".join(f"    = {e} by {r_}" for e, r_ in steps)
    text = (f"lemma drawn(k) for k >= {low}, k == {r} mod {m}:\n"
            f"  {start} = {-value if sign else value}\n  chain {start}\n{body}\nend\n")
    return text


@st.composite
def reciprocity_lemmas(draw):
    """s(c, k) by reciprocity for k in a class prime to c: the closed form from reduce and value."""
    c = draw(st.integers(2, 9))
    r = draw(st.sampled_from([x for x in range(1, c) if Fraction(x, c).denominator == c]))
    value = s(r, c)
    rhs = f"({c}/k + k/{c} + 1/({c}*k))/12 - 1/4 - ({value})"
    expanded = draw(st.booleans())
    final = rhs
    if expanded:
        # the same closed form as one fraction: (k^2 + c^2 + 1 - 3 c k - 12 c k v)/(12 c k)
        v = value
        final = f"(k^2 + {c * c + 1} - {3 * c}*k - {12 * c * v}*k)/({12 * c}*k)"
    text = (f"lemma drawn(k) for k >= 1, k == {r} mod {c}:\n  dedekind({c}, k) = {final}\n"
            f"  chain dedekind({c}, k)\n"
            f"    = ({c}/k + k/{c} + 1/({c}*k))/12 - 1/4 - dedekind(k, {c}) by reciprocity\n"
            f"    = ({c}/k + k/{c} + 1/({c}*k))/12 - 1/4 - dedekind({r}, {c}) by reduce\n"
            f"    = {final} by value\nend\n")
    return text


@settings(max_examples=100, deadline=None)
@given(st.one_of(residue_lemmas(), reciprocity_lemmas()))
def test_random_true_lemmas_built_from_the_rules_are_accepted(text):
    report = check_text(text)
    assert report.ok, (text, report.failures)


def _standalone_lemmas():
    """The library lemmas that use no other lemma, each as a certificate of its own."""
    blocks = re.findall(r"^lemma .*?^end$", LIBRARY.read_text(), flags=re.S | re.M)
    return [b + "\n" for b in blocks if " by lemma " not in b]


STANDALONE = _standalone_lemmas()


@settings(max_examples=80, deadline=None)
@given(st.sampled_from(STANDALONE), st.data())
def test_corrupting_one_symbol_of_a_proved_lemma_is_rejected(text, data):
    """A single-symbol change in the statement or in a line of the proof is refused, unless the changed
    line still has the value of the original at every instance tried (an equivalent mutant)."""
    from checker.kernel.evaluation import Evaluator
    from checker.language.parsing import parse_certificate
    from checker.replay.instances import Sampler
    options = corruptions(text)
    assume_any(options)
    mutant, original_line, mutated_line = data.draw(st.sampled_from(options))
    report = check_text(mutant)
    if report.ok:
        # accepted: then it must be an equivalent mutant on the lemma's own instances
        cert = parse_certificate(text)
        lemma = cert.statements[0]
        sampler = Sampler(Evaluator(), lemma.params, lemma.conditions)
        from checker.language.parsing import parse_expression
        for env in sampler.small(40):
            a = sampler._value(parse_expression(original_line), env)
            b = sampler._value(parse_expression(mutated_line), env)
            assert a == b, (mutant, env)
    else:
        assert report.exit_code in (1, 2), report.failures


# a statement line (after the lemma's header), a step, or a chain written on one line
_EXPRESSION_LINE = re.compile(r"^(\s*(?:= |chain (?:\w+: )?\S.*? = |(?!chain\b|split\b|residue\b|lemma\b|end\b|#)\S.*? = ))"
                              r"(.*?)(\s+by .*)?$")
_SYMBOL = re.compile(r"\d+|[+\-*/]")


def corruptions(text):
    """(mutant text, original expression, mutated expression) for one changed symbol each:
    a number one larger, or an operator replaced by another."""
    out = []
    lines = text.split("\n")
    for i, line in enumerate(lines):
        m = _EXPRESSION_LINE.match(line)
        if not m or line.strip().startswith(("lemma", "split", "residue")):
            continue
        head, expr, tail = m.group(1), m.group(2), m.group(3) or ""
        for sym in _SYMBOL.finditer(expr):
            t = sym.group()
            replacement = str(int(t) + 1) if t.isdigit() else {"+": "-", "-": "+", "*": "/", "/": "*"}[t]
            changed = expr[:sym.start()] + replacement + expr[sym.end():]
            mutant = lines[:i] + [head + changed + tail] + lines[i + 1:]
            out.append(("\n".join(mutant), expr, changed))
    return out


def assume_any(options):
    from hypothesis import assume
    assume(options)


# -- budgets -----------------------------------------------------------------------------------

def test_lemma_degree_limit_refuses_huge_powers_at_once():
    text = ("lemma f(k) for k >= 1:\n  (k + 1)^3000 = (k + 1)^3000\n"
            "  chain (k + 1)^3000 = (k + 1)^3000 by arithmetic\nend\n")
    report = check_text(text)
    f = report.failures[0]
    assert f.kind == "limit" and report.exit_code == 2
    assert "the power 3000 here needs 3000, over the limit lemma-degree = 200" in f.message


def test_lemma_degree_limit_counts_products():
    product = "*".join(["(k + 1)"] * 250)
    text = f"lemma f(k) for k >= 1:\n  {product} = 0\n  chain {product} = 0 by arithmetic\nend\n"
    assert "over the limit lemma-degree = 200" in check_text(text).failures[0].message


# -- the derivations the manuscript-style proofs lean on -------------------------------------------

def test_gcd_of_neighbours_is_derived_for_reciprocity():
    # gcd(k - 1, k) = 1 always (one Euclid step); k - 1 >= 1 from k >= 2
    text = """lemma neighbours(k) for k >= 2:
  dedekind(k - 1, k) + dedekind(k, k - 1) = ((k - 1)/k + k/(k - 1) + 1/((k - 1)*k))/12 - 1/4
  chain dedekind(k - 1, k) + dedekind(k, k - 1)
    = ((k - 1)/k + k/(k - 1) + 1/((k - 1)*k))/12 - 1/4 - dedekind(k, k - 1) + dedekind(k, k - 1)  by reciprocity
    = ((k - 1)/k + k/(k - 1) + 1/((k - 1)*k))/12 - 1/4                                           by arithmetic
end
"""
    assert check_text(text).ok
    f = failure(text.replace("for k >= 2", "for k >= 1"))
    assert "dedekind(k, k - 1) is not defined for every allowed value: the assumptions do not give " \
           "k - 1 >= 1" in f.message


def test_residue_of_k_plus_one_modulo_k():
    # (k + 1) mod k = 1 for k >= 2, and not for k = 1
    text = "lemma m(k) for k >= 2:\n  mod(k + 1, k) = 1\n  chain mod(k + 1, k) = 1 by arithmetic\nend\n"
    assert check_text(text).ok
    assert "mod(k + 1, k) is not fixed by the assumptions" in failure(text.replace("k >= 2", "k >= 1")).message


def test_inverse_from_an_assumed_congruence():
    # s(h', k) = s(h, k) from h h' = 1 (mod k); without it the rule is refused
    text = """lemma inv(h, g, k) for k >= 1, h*g == 1 mod k:
  dedekind(g, k) = dedekind(h, k)
  chain dedekind(g, k) = dedekind(h, k) by inverse
end
"""
    assert check_text(text).ok
    f = failure(text.replace(", h*g == 1 mod k", ", gcd(h, k) = 1"))
    assert any("the assumptions do not give g*h - 1 = 0 (mod k)" in d for d in f.details)


def test_every_one_symbol_corruption_of_the_standalone_lemmas():
    """All of them, not a sample: each is refused, except the three that say the same thing
    (s(1, 1) = s(0, 1) = 0, the same for s_3, and 3 - 2 mod(k, 3) = +-1 makes * and / agree)."""
    accepted = []
    for text in STANDALONE:
        for mutant, original, changed in corruptions(text):
            report = check_text(mutant)
            if report.ok:
                accepted.append((original, changed))
            else:
                assert report.exit_code in (1, 2) and report.failures[0].kind != "checker bug"
    assert accepted == [
        ("(1/k + k + 1/k)/12 - 1/4 - dedekind(0, 1)", "(1/k + k + 1/k)/12 - 1/4 - dedekind(1, 1)"),
        ("(k^2 - 9*k + 10 - 2*k*(3 - 2*mod(k, 3)))/(36*k)", "(k^2 - 9*k + 10 - 2*k/(3 - 2*mod(k, 3)))/(36*k)"),
        ("-(k^2 - 1)*(k^2 - 4)/(120*k^3) - generalized_dedekind(3, 0, 1)/k^2",
         "-(k^2 - 1)*(k^2 - 4)/(120*k^3) - generalized_dedekind(3, 1, 1)/k^2"),
    ]


def test_use_refuses_chains_deeper_than_sixteen(tmp_path):
    for i in range(20):
        (tmp_path / f"f{i}.qcert").write_text(f'use "f{i + 1}.qcert"\n')
    (tmp_path / "f20.qcert").write_text("claim 1 = 1\n")
    f = check_file(tmp_path / "f0.qcert").failures[0]
    assert "use is nested more than 16 certificates deep" in f.message


def test_use_of_a_folder_or_binary_file_is_a_plain_refusal(tmp_path):
    (tmp_path / "dir.qcert").mkdir()
    (tmp_path / "bin.qcert").write_bytes(b"\xff\xfe\x00")
    (tmp_path / "main.qcert").write_text('use "dir.qcert"\n')
    assert "dir.qcert does not check" in check_file(tmp_path / "main.qcert").failures[0].message
    (tmp_path / "main.qcert").write_text('use "bin.qcert"\n')
    assert "not UTF-8" in check_file(tmp_path / "main.qcert").failures[0].message


def test_latex_marks_a_failing_lemma_step():
    from checker.interfaces.latex import certificate_latex
    doc = certificate_latex(TWO_ODD.replace("(k - 1)*(k - 5)/(24*k)                            by value",
                                            "(k - 1)*(k - 7)/(24*k) by value"))
    # a false lemma is a claimed lemma with an attempted proof, not "Lemma ... Proof ... square"
    assert r"\paragraph{Claimed lemma (two\_odd), not verified.}" in doc and r"\square" not in doc
    marked = [ln for ln in doc.splitlines() if r"\fbox" in ln]
    assert len(marked) == 1 and "by value" not in marked[0] and r"\text{(value)}" in marked[0]


def test_an_edited_file_two_uses_deep_is_checked_again(tmp_path):
    # a.qcert uses b.qcert uses c.qcert; after c is made false, a must fail, though b is unchanged
    (tmp_path / "c.qcert").write_text(TWO_ODD)
    (tmp_path / "b.qcert").write_text('use "c.qcert"\n')
    (tmp_path / "a.qcert").write_text('use "b.qcert"\nchain dedekind(2, 9) = 8*4/(24*9) by lemma two_odd(9)\n')
    assert check_file(tmp_path / "a.qcert").ok
    (tmp_path / "c.qcert").write_text(TWO_ODD.replace("by reduce", "by negate"))
    f = check_file(tmp_path / "a.qcert").failures[0]
    assert "b.qcert does not check" in f.message and "c.qcert does not check" in f.message
