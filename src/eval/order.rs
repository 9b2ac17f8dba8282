//! Dependency order: which definitions must be evaluated before which, and the cycles that make
//! an order impossible. Kahn's algorithm keeps this linear in the size of the sheet.

/// The result of ordering `count` definitions.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Order {
    /// Definitions that can be evaluated, dependencies first.
    pub sequence: Vec<usize>,
    /// Each cycle found, as definition indices in dependency order (first element repeated
    /// implicitly at the end).
    pub cycles: Vec<Vec<usize>>,
    /// Definitions not in `sequence`: in a cycle or downstream of one.
    pub blocked: Vec<usize>,
}

/// Orders definitions given, for each, the definitions it depends on.
pub fn dependency_order(dependencies: &[Vec<usize>]) -> Order {
    let count = dependencies.len();
    let mut dependents: Vec<Vec<usize>> = vec![Vec::new(); count];
    let mut waiting_on = vec![0usize; count];
    for (node, needs) in dependencies.iter().enumerate() {
        waiting_on[node] = needs.len();
        for &need in needs {
            dependents[need].push(node);
        }
    }
    let mut ready: Vec<usize> = (0..count)
        .rev()
        .filter(|node| waiting_on[*node] == 0)
        .collect();
    let mut sequence = Vec::with_capacity(count);
    while let Some(node) = ready.pop() {
        sequence.push(node);
        for &dependent in &dependents[node] {
            waiting_on[dependent] -= 1;
            if waiting_on[dependent] == 0 {
                ready.push(dependent);
            }
        }
    }
    let blocked: Vec<usize> = (0..count).filter(|node| waiting_on[*node] > 0).collect();
    let cycles = find_cycles(dependencies, &waiting_on, &blocked);
    Order {
        sequence,
        cycles,
        blocked,
    }
}

/// Every blocked node is in a cycle or depends on one; walking blocked dependencies from each
/// node not yet explained must revisit a node, and the loop from that node is a cycle.
fn find_cycles(
    dependencies: &[Vec<usize>],
    waiting_on: &[usize],
    blocked: &[usize],
) -> Vec<Vec<usize>> {
    let mut in_reported_cycle = vec![false; dependencies.len()];
    let mut cycles = Vec::new();
    for &start in blocked {
        if in_reported_cycle[start] {
            continue;
        }
        let mut position_in_path = std::collections::HashMap::new();
        let mut path = Vec::new();
        let mut node = start;
        loop {
            if let Some(&position) = position_in_path.get(&node) {
                let cycle: Vec<usize> = path[position..].to_vec();
                if !cycle
                    .iter()
                    .any(|member: &usize| in_reported_cycle[*member])
                {
                    for member in &cycle {
                        in_reported_cycle[*member] = true;
                    }
                    cycles.push(cycle);
                }
                break;
            }
            if in_reported_cycle[node] {
                break;
            }
            position_in_path.insert(node, path.len());
            path.push(node);
            match dependencies[node]
                .iter()
                .find(|need| waiting_on[**need] > 0)
            {
                Some(next) => node = *next,
                None => break,
            }
        }
    }
    cycles
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dependencies_come_first() {
        // 0 needs 2, 2 needs 1.
        let order = dependency_order(&[vec![2], vec![], vec![1]]);
        assert_eq!(order.sequence, vec![1, 2, 0]);
        assert!(order.cycles.is_empty());
    }

    #[test]
    fn cycle_is_reported_once_and_dependents_blocked() {
        // 0 -> 1 -> 2 -> 0, and 3 depends on the cycle.
        let order = dependency_order(&[vec![1], vec![2], vec![0], vec![0], vec![]]);
        assert_eq!(order.sequence, vec![4]);
        assert_eq!(order.cycles, vec![vec![0, 1, 2]]);
        assert_eq!(order.blocked, vec![0, 1, 2, 3]);
    }

    #[test]
    fn self_reference_is_a_cycle() {
        let order = dependency_order(&[vec![0]]);
        assert_eq!(order.cycles, vec![vec![0]]);
    }
}
