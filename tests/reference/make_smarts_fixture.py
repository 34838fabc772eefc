#!/usr/bin/env python3
"""Writes tests/reference/smarts_matches.json: RDKit's substructure matches for every pair of
(molecule, SMARTS pattern) below, checked by tests/smarts_rdkit.rs against phdose's matcher.

Patterns: every SMARTS row of the Wildman-Crippen atom-type table
(../shared/reference/crippen-atom-contributions.txt, read here, not copied), the ionizable
groups a pKa table needs, and patterns that exercise each SMARTS primitive and operator.
Molecules: drug-like and lab molecules chosen for this fixture, written without [H] atoms.

Matches are `mol.GetSubstructMatches(patt, uniquify=True, maxMatches=100000)` (RDKit's default
uniquify; the match cap raised so that no list is cut short), sorted.

Run from the repository root:  python3 tests/reference/make_smarts_fixture.py
"""

import json
import os

import rdkit
from rdkit import Chem

HERE = os.path.dirname(os.path.abspath(__file__))
REPO = os.path.dirname(os.path.dirname(HERE))
CRIPPEN = os.path.join(REPO, "..", "shared", "reference", "crippen-atom-contributions.txt")
OUT = os.path.join(HERE, "smarts_matches.json")

MOLECULES = [
    "CC(=O)O",  # acetic acid
    "CC(=O)[O-].[Na+]",  # sodium acetate
    "Oc1ccccc1",  # phenol
    "OC1=CC=CC=C1",  # phenol, Kekulé spelling
    "OC(=O)C1=CC=CC=C1",  # benzoic acid, Kekulé spelling
    "CCN(CC)CC.Cl",  # triethylamine hydrochloride
    "CC[NH3+].[Cl-]",  # ethylammonium chloride
    "C[N+](C)(C)C.[Br-]",  # tetramethylammonium bromide
    "c1ccncc1",  # pyridine
    "C1=CC=NC=C1",  # pyridine, Kekulé spelling
    "c1c[nH]cn1",  # imidazole
    "Cc1nc[nH]c1",  # 4-methylimidazole
    "CC(=O)Nc1ccc(O)cc1",  # paracetamol
    "CC(=O)Oc1ccccc1C(=O)O",  # aspirin
    "CN1C=NC2=C1C(=O)N(C(=O)N2C)C",  # caffeine, Kekulé spelling
    "NCCc1c[nH]c2ccccc12",  # tryptamine
    "NC(=N)N",  # guanidine
    "NC(=[NH2+])N",  # guanidinium
    "CC(=N)N",  # acetamidine
    "O=C1NC(=O)c2ccccc12",  # phthalimide
    "NS(=O)(=O)c1ccc(N)cc1",  # sulfanilamide
    "CCS",  # ethanethiol
    "NC(CS)C(=O)O",  # cysteine
    "[NH3+]CC(=O)[O-]",  # glycine zwitterion
    "OC(=O)CC(O)(CC(=O)O)C(=O)O",  # citric acid
    "c1ccc2ccccc2c1",  # naphthalene
    "c1ccc2c(c1)ccc1ccccc12",  # phenanthrene
    "c1ccc2[nH]ccc2c1",  # indole
    "c1ccoc1",  # furan
    "c1ccsc1",  # thiophene
    "OC(=O)c1ccccn1",  # picolinic acid
    "CN1CCC[C@H]1c1cccnc1",  # nicotine (stereo mark read and ignored)
    "NC1CCCCC1",  # cyclohexylamine
    "Oc1ccc(cc1)[N+](=O)[O-]",  # 4-nitrophenol
    "CC(C)Cc1ccc(cc1)C(C)C(=O)O",  # ibuprofen
    "c1ccc(cc1)-c1ccccc1",  # biphenyl
    "C1CC2CCC1C2",  # norbornane
    "C1CCC2(CC1)CC2",  # spiro[2.5]octane
    "O=C1CCCN1",  # 2-pyrrolidone
    "c1ncc2nc[nH]c2n1",  # purine
    "CC(C)(C)OC(N)=O",  # tert-butyl carbamate
    "[13CH3]C(=O)O",  # acetic acid-2-13C
    "OB(O)c1ccccc1",  # phenylboronic acid
    "OC(=O)C(F)(F)F",  # trifluoroacetic acid
    "COP(=O)(O)O",  # methyl phosphate
    "Clc1ccc(Br)cc1I",  # a trihalobenzene
    "CC#N",  # acetonitrile
    "C=CC=O",  # acrolein
    "O=C1C=CC(=O)C=C1",  # 1,4-benzoquinone
    "[O-][n+]1ccccc1",  # pyridine N-oxide
    "c1cc[se]c1",  # selenophene
    "CS(=O)(=O)N",  # methanesulfonamide
    "CS(C)=O",  # dimethyl sulfoxide
    "OC(=O)/C=C/c1ccccc1",  # trans-cinnamic acid
    "c1nn[nH]n1",  # tetrazole
    "CC(=O)CC(C)=O",  # acetylacetone
    "Clc1ccc(cc1)C(c1ccccc1)N1CCN(C)CC1",  # chlorcyclizine
    "C1C2CC3CC1CC(C2)C3",  # adamantane
    "C12C3C4C1C5C2C3C45",  # cubane
    "c1ccc2cc3ccccc3cc2c1",  # anthracene
    "O=c1cc[nH]cc1",  # 4-pyridone
    "Cn1cccc1",  # N-methylpyrrole
    "c1ccc2c(c1)[nH]c1ccccc12",  # carbazole
]

IONIZABLE = [
    "[CX3](=O)[OX2H1]",  # carboxylic acid
    "[CX3](=O)[OX1H0-]",  # carboxylate
    "[CX3](=O)[OX1H0-,OX2H1]",  # acid or its anion
    "[OX2H1]c",  # phenol
    "[OX2H1][CX4]",  # alcohol
    "[NX3;H2,H1,H0;!$(NC=[O,S,N]);!$(NS=O);!$(Na);!$(N-[CX3]=[CX3])]",  # aliphatic amine
    "[NX3;H2;!$(NC=[O,S,N]);!$(Na)]",  # primary aliphatic amine
    "[$([NX3;H2,H1;!$(NC=O)])]",  # NH amine, not amide (recursive)
    "[NX3;H2,H1;!$(NC=O)]c",  # aniline-type N
    "[NX3;H2,H1,H0;+0;!$(NC=O);!$(NS=O)]",  # neutral amine N
    "[NX4+;H3,H2,H1]",  # protonated amine
    "[NX4+;H0]",  # quaternary ammonium
    "[nX2;r6]",  # pyridine-type N
    "[$([nX2]1ccccc1)]",  # pyridine N (recursive)
    "[nX2;r5]",  # azole N
    "c1cnc[nH]1",  # imidazole ring
    "[nX2;r5]:c:[nX3;H1]",  # imidazole N...NH
    "[nH;r5]",  # pyrrole-type N-H
    "[nH+]",  # pyridinium
    "[NX3;H1,H2][SX4](=O)(=O)",  # sulfonamide N-H
    "[SX2H1][#6]",  # thiol
    "[CX3](=O)[NX3;H1][CX3](=O)",  # imide N-H
    "[CX3](=[NX2;!$(N-O)])[NX3;H2,H1]",  # amidine
    "[NX3][CX3](=[NX2])[NX3]",  # guanidine
    "[NX3][CX3](=[NX3+])[NX3]",  # guanidinium
    "[$([NX3](=O)=O),$([NX3+](=O)[O-])][!#8]",  # nitro
    "P(=O)([OX2H1])[OX2H1]",  # phosphate acid
    "B([OX2H1])[OX2H1]",  # boronic acid
    "c1nnn[nH]1",  # tetrazole
    "[#6][CX4;H1,H2]([CX3]=O)[CX3]=O",  # 1,3-dicarbonyl C-H
    "[CX4;H1,H2]([CX3]=O)[CX3]=O",  # 1,3-dicarbonyl C-H, anywhere
    "[NX3;H1;$(N(C=O)C=O)]",  # imide via recursion
    "[O-][n+]",  # N-oxide
]

PRIMITIVES = [
    "*", "a", "A", "[#6]", "[#7,#8]", "C", "c", "N", "n", "O", "o", "s", "S", "[se]", "F",
    "Cl", "Br", "I", "[Cl]", "[I]", "B", "P",
    "[H]", "[#1]", "[2H]", "[H+]", "[13C]", "[13CH3]", "[12C]",
    "[CH3]", "[CH2]", "[CH]", "[CH0]", "[H2]", "[NH2]", "[!H0]", "[OH]", "[nH]",
    "[h]", "[h0]", "[h1]", "[h2]", "[h3]", "[N;h3]", "[!h]",
    "[D]", "[D1]", "[D2]", "[D3]", "[D4]", "[X]", "[X1]", "[X2]", "[X3]", "[X4]",
    "[R]", "[R0]", "[R1]", "[R2]", "[R3]", "[r]", "[r3]", "[r5]", "[r6]", "[r0]",
    "[x]", "[x0]", "[x2]", "[x3]", "[x4]",
    "[v]", "[v1]", "[v2]", "[v3]", "[v4]", "[v5]", "[v6]",
    "[+]", "[++]", "[+1]", "[-]", "[-1]", "[--]", "[+0]", "[N+]", "[O-]", "[n+]", "[N+0]",
    "[C:1]", "[N:2]C", "[C:1]=[O:2]",
    "[!C]", "[!c;!N]", "[C,N]", "[c,n;H1]", "[C&H2]", "[CH2,NH2]", "[N,O;!H0]", "[!#6;!#1]",
    "[C,c;!R]", "[!!N]", "[#6;X3;!a]", "[a;!c]", "[A;r5]",
    "[$(*=O)]", "[$(a)]", "[C;$(C(=O)O),$(C#N)]", "[!$([#6]=O)&#6]", "[$(C[$(O=C)])]",
    "[$(C~[$(O=C)])]", "[O;$(O[CX4]),$(Oc)]", "[$(c1ccccc1)]", "[$([#6]-[#7])]",
    "C-C", "C=C", "C#C", "C#N", "c:c", "c-c", "a-a", "a:a", "*~*", "*@*", "*!@*", "C=,#*",
    "[#6]-,:[#7]", "*-&!@*", "*-;!@*", "[#6]!-[#6]", "*=@*", "*:,=*", "C/C=C/C", "C/C=C\\C",
    "*-@*", "c!:c",
    "c1ccccc1", "C1CCCCC1", "[#6]1~[#6]~[#6]~[#6]~[#6]~1", "c12ccccc1cccc2", "*1**1",
    "*1****1", "C%10CCCC%10", "[R]1@[R]@[R]@[R]@[R]@[R]@1", "c1cc2ccccc2cc1",
    "O.O", "[OH].[NH2]", "[#7].[#8]", "C.C.C", "[Na+].[O-]",
    "[C@H]", "[C@@H](N)C", "[C@]", "CC(C)(C)C", "*(~*)(~*)~*", "O=C(O)c1ccccc1",
    "[c;x3;R2]", "a(:a):a", "O=C-C=C", "N-C=O", "[#6](=O)(-[#8])",
]


def crippen_patterns():
    """Every SMARTS row of the Wildman-Crippen table, first ID kept for repeats."""
    rows = []
    seen = set()
    with open(CRIPPEN) as f:
        for line in f:
            if line.startswith("#") or not line.strip():
                continue
            fields = line.rstrip("\n").split("\t")
            type_id, smarts = fields[0], fields[1]
            if smarts not in seen:
                seen.add(smarts)
                rows.append((smarts, "crippen " + type_id))
    return rows


def main():
    patterns = crippen_patterns()
    for origin, group in (("ionizable", IONIZABLE), ("primitive", PRIMITIVES)):
        for smarts in group:
            if smarts not in {p for p, _ in patterns}:
                patterns.append((smarts, origin))
    compiled = []
    for smarts, _ in patterns:
        patt = Chem.MolFromSmarts(smarts)
        assert patt is not None, smarts
        compiled.append(patt)
    mols = []
    for smiles in MOLECULES:
        mol = Chem.MolFromSmiles(smiles)
        assert mol is not None, smiles
        assert all(a.GetAtomicNum() != 1 for a in mol.GetAtoms()), smiles
        mols.append(mol)
    matches = [
        [
            sorted(list(t) for t in mol.GetSubstructMatches(patt, uniquify=True, maxMatches=100000))
            for patt in compiled
        ]
        for mol in mols
    ]
    pairs = len(mols) * len(compiled)
    lines = [
        "{",
        '  "rdkit_version": %s,' % json.dumps(rdkit.__version__),
        '  "generator": "tests/reference/make_smarts_fixture.py",',
        '  "pairs": %d,' % pairs,
        '  "molecules": %s,' % json.dumps(MOLECULES, indent=4).replace("\n]", "\n  ]"),
        '  "patterns": [',
        ",\n".join(
            '    {"smarts": %s, "origin": %s}' % (json.dumps(s), json.dumps(o)) for s, o in patterns
        ),
        "  ],",
        '  "matches_by_molecule": [',
        ",\n".join("    " + json.dumps(row, separators=(",", ":")) for row in matches),
        "  ]",
        "}",
    ]
    with open(OUT, "w") as f:
        f.write("\n".join(lines) + "\n")
    print("wrote %s: %d molecules x %d patterns = %d pairs (RDKit %s)"
          % (OUT, len(mols), len(compiled), pairs, rdkit.__version__))


if __name__ == "__main__":
    main()
